import { expect, test } from 'vitest';
import { alignPeriod } from '../../src/signal/align.js';

const period = (n: number, phase: number, f: (p: number) => number) => Float64Array.from({ length: n }, (_, i) => f((i / n + phase) % 1));
const triangle = (p: number) => (p < 0.5 ? -1 + 4 * p : 3 - 4 * p);

test('a captured period at another phase and length is rotated onto the expected one', () => {
  // Expected: 64-sample triangle from phase 0; captured: 100 samples from phase 0.37, shifted by 0.2 V.
  const expected = period(64, 0, triangle);
  const captured = period(100, 0.37, (p) => triangle(p) + 0.2);
  const out = alignPeriod(expected, captured, 2);
  expect(out.length).toBe(128);
  // After alignment each sample is within a resampling step of expected + 0.2 V
  // (one lag step of a ±1 V triangle moves it by 4/64 V at most; arithmetic on the test signal).
  for (let i = 0; i < 128; i++) expect(Math.abs((out[i] ?? 0) - ((expected[i % 64] ?? 0) + 0.2))).toBeLessThan(4 / 64 + 1e-9);
});

test('degenerate input gives an empty trace, not NaN', () => {
  expect(alignPeriod(new Float64Array(1), new Float64Array(10)).length).toBe(0);
});
