import { describe, expect, test } from 'vitest';
import { verdictFor } from '../../src/analysis/verdict.js';

// ILAC-G8:09/2019 simple acceptance with a guard band (from memory): pass when the
// reading ± U lies inside the tolerance interval, fail when wholly outside, else marginal.
const band = { nominal: 10, worst: { min: 9.5, max: 10.5 } };
const spec = { relative: 0.01, absolute: 0.02 };

describe('verdict with a guard band', () => {
  test.each([
    [10, 'pass'], // U = 0.12: 9.88 … 10.12 inside
    [10.37, 'pass'], // U = 0.1237: 10.37 + 0.1237 = 10.4937 ≤ 10.5
    [10.38, 'marginal'], // U = 0.1238: 10.38 + 0.1238 = 10.5038 > 10.5
    [10.45, 'marginal'],
    [10.7, 'fail'], // 10.7 − 0.127 = 10.573 > 10.5
    [9.3, 'fail'],
    [9.55, 'marginal'],
  ] as const)('%d → %s', (reading, expected) => {
    // Hand arithmetic: U = 1 % of the reading + 20 mV.
    const r = verdictFor(band, reading, spec);
    const u = 0.01 * reading + 0.02;
    const want = reading - u >= 9.5 && reading + u <= 10.5 ? 'pass' : reading + u < 9.5 || reading - u > 10.5 ? 'fail' : 'marginal';
    expect(r.verdict).toBe(want);
    expect(r.verdict).toBe(expected);
    expect(r.uncertainty).toBeCloseTo(u, 12);
  });

  test('deviation and position', () => {
    const r = verdictFor(band, 10.25, undefined);
    expect(r.deviation).toBeCloseTo(0.025, 12);
    expect(r.position).toBeCloseTo(0.75, 12);
  });

  test('an open circuit (OL, +∞) on a one-sided ≥ band passes without a guard band; on a bounded band it fails', () => {
    const toGround = { nominal: 100, worst: { min: 100, max: Number.POSITIVE_INFINITY } };
    const open = verdictFor(toGround, Number.POSITIVE_INFINITY, { relative: 0.01, absolute: 1 });
    expect(open.verdict).toBe('pass');
    expect(open.uncertainty).toBe(0);
    expect(open.warnings).toEqual([]);
    expect(verdictFor(band, Number.POSITIVE_INFINITY, spec).verdict).toBe('fail');
    // A rail that reads 3 Ω to ground unpowered is a short (common practice, no source).
    expect(verdictFor(toGround, 3, { relative: 0.01, absolute: 1 }).verdict).toBe('fail');
  });

  test('NaN is never a pass', () => {
    expect(verdictFor(band, Number.NaN, spec).verdict).toBe('fail');
  });
});
