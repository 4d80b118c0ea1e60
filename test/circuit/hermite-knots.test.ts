import { describe, expect, test } from 'vitest';
import { hermiteCoefficients, interpolateKnots } from '../../src/circuit/hermite-knots.js';

describe('cubic Hermite between knots', () => {
  test('reproduces a cubic from its values and slopes at the knots, and clamps outside them to the end intervals', () => {
    // A cubic Hermite interpolant is exact for any cubic (any numerical analysis text): p(x) = 2x³ − x² + 0.5x − 3.
    const p = (x: number) => 2 * x ** 3 - x ** 2 + 0.5 * x - 3;
    const dp = (x: number) => 6 * x ** 2 - 2 * x + 0.5;
    const lo = -1.5;
    const intervals = 7;
    const h = 0.5;
    const values = Float64Array.from({ length: intervals + 1 }, (_, j) => p(lo + j * h));
    const slopes = Float64Array.from({ length: intervals + 1 }, (_, j) => dp(lo + j * h));
    const coef = new Float64Array(4 * intervals);
    hermiteCoefficients(values, slopes, h, intervals, coef);
    // Inside the knots, at the knots, and a little beyond both ends (the end intervals' cubic, still p).
    const x = Float64Array.from([-1.6, -1.5, -1.2, -0.3, 0, 0.77, 1.0, 1.99, 2.0, 2.1]);
    const out = new Float64Array(x.length);
    interpolateKnots(x, lo, h, intervals, coef, out);
    // Rounding only: 1e-12 of values up to about 20.
    for (const [i, xi] of x.entries()) expect(Math.abs((out[i] as number) - p(xi))).toBeLessThan(1e-12);
  });
});
