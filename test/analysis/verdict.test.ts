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

describe('a band that stops at a physical floor is guarded on its open side only (issue 11, item 6)', () => {
  // Guarded acceptance with w = U (ILAC-G8:09/2019 terms, from memory): a reading passes when
  // reading ± U lies inside the band. Below a physical floor nothing true can lie (a dead band
  // is never narrower than 0 V, a THD never below 0), so at that edge the band needs no guard:
  // common practice, no source. The meter below: 0.5 % + 2 mV.
  const meter = { relative: 0.005, absolute: 0.002 };
  const deadband = { nominal: 0, worst: { min: 0, max: 0.234 }, floor: 0 };

  test('a perfect dead band of 0 V passes (it was marginal)', () => {
    expect(verdictFor(deadband, 0, meter).verdict).toBe('pass');
    expect(verdictFor(deadband, 0.001, meter).verdict).toBe('pass');
  });

  test('the open side keeps its guard band', () => {
    // 0.231 + (0.005·0.231 + 0.002) = 0.2341 > 0.234: straddles the top edge.
    expect(verdictFor(deadband, 0.231, meter).verdict).toBe('marginal');
    expect(verdictFor(deadband, 0.228, meter).verdict).toBe('pass');
    expect(verdictFor(deadband, 0.3, meter).verdict).toBe('fail');
  });

  test('a reading below the floor by more than its uncertainty is impossible: fail', () => {
    expect(verdictFor(deadband, -0.0015, meter).verdict).toBe('pass'); // within U of the floor
    expect(verdictFor(deadband, -0.05, meter).verdict).toBe('fail');
  });

  test('without a floor, the same band guards both edges (unchanged)', () => {
    const twoSided = { nominal: 0, worst: { min: 0, max: 0.234 } };
    expect(verdictFor(twoSided, 0, meter).verdict).toBe('marginal');
  });

  test('a band whose minimum lies above the floor is guarded on both sides', () => {
    const thd = { nominal: 0.0075, worst: { min: 0.007, max: 0.039 }, floor: 0 };
    expect(verdictFor(thd, 0.007, { relative: 0.01, absolute: 0.0005 }).verdict).toBe('marginal');
  });
});

describe('kinds give the floor where physics gives one', () => {
  test('the dead band, THD and the idle current carry floor 0; a voltage level does not', async () => {
    const { loadPlanFile } = await import('../../src/plan/load.js');
    const { computeTargets } = await import('../../src/analysis/targets.js');
    const plan = await loadPlanFile('demo/exciter.plan.json');
    const set = computeTargets(plan, { trials: 200, seed: 1 });
    const floor = (id: string) => set.targets.find((t) => t.check === id)?.floor;
    expect(floor('drive.deadband')).toBe(0);
    expect(floor('shaper.out.thd')).toBe(0);
    expect(floor('rails.idle-current')).toBe(0);
    expect(floor('osc.freq')).toBeUndefined();
    expect(floor('rails.+12V.dc')).toBeUndefined();
  });
});
