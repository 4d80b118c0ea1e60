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
    // U = 1 % of the reading + 20 mV, the spec above (hand arithmetic).
    expect(r.uncertainty).toBeCloseTo(u, 12);
  });

  test('an uncertainty as wide as the band: warned, and no reading can pass', () => {
    // U = 1 % of 10 V + 20 mV = 0.12 V (hand arithmetic), so 2U = 0.24 V.
    const narrow = { nominal: 10, worst: { min: 9.9, max: 10.1 } }; // 0.2 V wide < 2U
    const warning = 'the instrument uncertainty is as wide as the band: this reading cannot pass; use a better instrument or range';
    for (const reading of [9.9, 10, 10.1]) {
      const r = verdictFor(narrow, reading, spec);
      expect(r.warnings).toEqual([warning]);
      // Reading ± U always reaches past an edge (ILAC-G8 guard band), so the best it gets is marginal.
      expect(r.verdict).toBe('marginal');
    }
    // 0.3 V wide > 2U: a centred reading passes and nothing is said.
    const wide = verdictFor({ nominal: 10, worst: { min: 9.85, max: 10.15 } }, 10, spec);
    expect(wide.warnings).toEqual([]);
    expect(wide.verdict).toBe('pass');
    // No uncertainty given: no warning however narrow the band.
    expect(verdictFor(narrow, 10, undefined).warnings).toEqual([]);
  });

  test('deviation and position', () => {
    const r = verdictFor(band, 10.25, undefined);
    // (10.25 − 10)/10 and (10.25 − 9.5)/(10.5 − 9.5), hand arithmetic.
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
