import fc from 'fast-check';
import { max, min, quantileSorted } from 'simple-statistics';
import { describe, expect, test } from 'vitest';
import { statCoverage } from '../../src/analysis/targets.js';
import { tailFigures } from '../../src/analysis/sampling.js';

// The reference: simple-statistics 7.12.1 `quantileSorted`, linear interpolation
// between order statistics at (n − 1)·p (Hyndman and Fan type 7, as its source says),
// on a full sort by the built-in Array sort. tailFigures selects instead of sorting.
function reference(values: readonly number[], pLow: number, pHigh: number) {
  const sorted = values.filter(Number.isFinite).sort((a, b) => a - b);
  return { min: min(sorted), max: max(sorted), low: quantileSorted(sorted, pLow), high: quantileSorted(sorted, pHigh) };
}

describe('tailFigures', () => {
  test('equals a full sort and simple-statistics quantileSorted, skipping non-finite values', () => {
    const value = fc.oneof(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.constantFrom(Number.NaN, Infinity, -Infinity, 0, 1, 1));
    fc.assert(
      fc.property(fc.array(value, { minLength: 1, maxLength: 400 }), fc.double({ min: 0, max: 1, noNaN: true }), (values, p) => {
        if (!values.some(Number.isFinite)) return;
        const got = tailFigures(Float64Array.from(values), p, statCoverage.high);
        const want = reference(values, p, statCoverage.high);
        // Same order statistics and the same interpolation: equal to rounding (relative 1e-12 of the data's range).
        const scale = Math.max(1, want.max - want.min);
        expect(got.min).toBe(want.min);
        expect(got.max).toBe(want.max);
        expect(Math.abs(got.low - want.low)).toBeLessThanOrEqual(1e-12 * scale);
        expect(Math.abs(got.high - want.high)).toBeLessThanOrEqual(1e-12 * scale);
      }),
      { seed: 4242, numRuns: 300 },
    );
  });

  test('hand-worked type 7 quantiles of 1 … 11 (h = 10·p; Hyndman and Fan 1996, from memory)', () => {
    const values = Float64Array.from([7, 3, 11, 1, 9, 5, 2, 10, 4, 8, 6]);
    const t = tailFigures(values, 0.25, 0.93);
    expect(t).toMatchObject({ min: 1, max: 11 });
    // p = 0.25 → h = 2.5 → 3 + 0.5·(4 − 3) = 3.5; p = 0.93 → h = 9.3 → 10 + 0.3·(11 − 10) = 10.3. Exact to 1e-12.
    expect(t.low).toBeCloseTo(3.5, 12);
    expect(t.high).toBeCloseTo(10.3, 12);
  });

  test('a Monte Carlo sized run (10,000 values, ties and gaps): the quantiles of the statistical band equal the full sort', () => {
    // The 0.135 % and 99.865 % quantiles lie 14 values from either end: read from a short sorted buffer, not a selection.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 - 1 }), (seed) => {
        let s = seed;
        const next = () => {
          s = (Math.imul(s, 48271) >>> 0) % 2147483647;
          return s / 2147483647;
        };
        const values = Array.from({ length: 10_000 }, () => (next() < 0.01 ? Number.NaN : next() < 0.2 ? Math.round(next() * 4) : next() * 2 - 1));
        const got = tailFigures(Float64Array.from(values), statCoverage.low, statCoverage.high);
        const want = reference(values, statCoverage.low, statCoverage.high);
        expect(Math.abs(got.low - want.low)).toBeLessThanOrEqual(1e-12);
        expect(Math.abs(got.high - want.high)).toBeLessThanOrEqual(1e-12);
      }),
      { seed: 77, numRuns: 20 },
    );
  });

  test('no finite value gives NaN throughout', () => {
    expect(tailFigures(Float64Array.from([Number.NaN, Infinity]), 0.1, 0.9)).toEqual({ min: Number.NaN, max: Number.NaN, low: Number.NaN, high: Number.NaN });
  });
});
