import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { mean, sampleStandardDeviation, min, max } from 'simple-statistics';
import { capabilityOf } from '../../src/review/capability.js';
import { spreadOf } from '../../src/review/stats.js';

describe('spread', () => {
  test('mean and sample sd agree with simple-statistics (independent library), rel 1e-12', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 2, maxLength: 60 }), (xs) => {
        const s = spreadOf(xs);
        const scale = Math.max(1, ...xs.map(Math.abs));
        // simple-statistics (an independent library): mean and sample SD.
        expect(Math.abs((s.mean ?? NaN) - mean(xs))).toBeLessThanOrEqual(1e-12 * scale);
        expect(Math.abs((s.sd ?? NaN) - sampleStandardDeviation(xs))).toBeLessThanOrEqual(1e-9 * scale);
        expect(s.min).toBe(min(xs));
        expect(s.max).toBe(max(xs));
      }),
      { numRuns: 200 },
    );
  });

  test('keeps the digits of a 10 kHz oscillator spread by millihertz (simple-statistics as reference, rel 1e-6)', () => {
    const xs = [10000.001, 10000.002, 10000.004, 9999.999, 10000.0];
    // simple-statistics (an independent library) for the sample SD.
    expect(spreadOf(xs).sd).toBeCloseTo(sampleStandardDeviation(xs), 9);
  });

  test('one reading has a mean but no sd; none has neither', () => {
    expect(spreadOf([3.3])).toEqual({ n: 1, mean: 3.3, sd: null, min: 3.3, max: 3.3 });
    expect(spreadOf([])).toEqual({ n: 0, mean: null, sd: null, min: null, max: null });
  });
});

describe('capability (NIST/SEMATECH e-Handbook §6.1.6)', () => {
  // The handbook's worked example, from memory: USL 20, LSL 8, mean 16, s 2
  // gives Cp = 12/12 = 1.0 and Cpk = min(4/6, 8/6) = 0.667. The readings
  // 14, 16, 18 have exactly that mean and sample sd (s² = (4+0+4)/2).
  test('worked example: Cp = 1.00, Cpk = 0.667 (abs 1e-12)', () => {
    const c = capabilityOf(spreadOf([14, 16, 18]), { min: 8, max: 20 });
    expect(c.status).toBe('ok');
    expect(c.cp).toBeCloseTo(1, 12);
    // NIST/SEMATECH e-Handbook §6.1.6: Cpk = min(USL − μ, μ − LSL)/(3σ), worked by hand.
    expect(c.cpk).toBeCloseTo(2 / 3, 12);
  });

  test('a centred process has Cpk = Cp; an off-band mean gives a negative Cpk', () => {
    const centred = capabilityOf(spreadOf([13, 14, 15]), { min: 8, max: 20 });
    // NIST/SEMATECH e-Handbook §6.1.6: a centred process has Cpk = Cp.
    expect(centred.cpk).toBeCloseTo(centred.cp ?? NaN, 12);
    // mean 22 above USL 20: Cpk = (20 − 22)/(3·1) = −0.667 (same formula)
    expect(capabilityOf(spreadOf([21, 22, 23]), { min: 8, max: 20 }).cpk).toBeCloseTo(-2 / 3, 12);
  });

  test('one reading or zero spread is "not enough data", never NaN or Infinity', () => {
    const one = capabilityOf(spreadOf([16]), { min: 8, max: 20 });
    expect(one).toMatchObject({ cp: null, cpk: null, status: 'not-enough-data' });
    expect(one.note).toContain('not enough data');
    const flat = capabilityOf(spreadOf([16, 16, 16, 16]), { min: 8, max: 20 });
    expect(flat).toMatchObject({ cp: null, cpk: null, status: 'no-spread' });
    expect(flat.note).toContain('not enough data');
    expect(capabilityOf(spreadOf([1, 2]), null)).toMatchObject({ cp: null, cpk: null, status: 'no-band' });
    expect(capabilityOf(spreadOf([1, 2]), { min: -Infinity, max: Infinity })).toMatchObject({ cp: null, cpk: null, status: 'no-band' });
  });

  test('a one-sided band (idle-current ceiling) gives Cpk from that side (Cpu, §6.1.6) and no Cp', () => {
    // mean 30 mA, s 2 mA, ceiling 45 mA: Cpu = (45 − 30)/(3·2) = 2.5
    const c = capabilityOf(spreadOf([0.028, 0.03, 0.032]), { min: 0, max: Infinity });
    expect(c.status).toBe('one-sided');
    expect(c.cp).toBeNull();
    // Cpl = (30 − 0)/(3·2) = 5 from the floor at 0 A
    expect(c.cpk).toBeCloseTo(5, 9);
    const ceiling = capabilityOf(spreadOf([0.028, 0.03, 0.032]), { min: -Infinity, max: 0.045 });
    expect(ceiling.cpk).toBeCloseTo(2.5, 9);
  });
});
