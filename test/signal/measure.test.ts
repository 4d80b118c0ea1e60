import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { measure } from '../../src/signal/measure.js';
import { CaptureError } from '../../src/signal/types.js';
import { sampled, sine, square, triangle } from './signals.js';

const fs = 1e6;
// A period that is not a whole number of samples, as in every real capture.
const period = 1000.37;
const n = Math.round(period * 20.6);

describe('RMS and mean over whole periods', () => {
  // Handbook formulas (any signals handbook): RMS of sine = peak/√2,
  // triangle = peak/√3, square = peak. Tolerance 0.1 %: the whole-period
  // window is rounded to whole samples, an error of about 1/n.
  test.each([
    ['sine', sine, 1 / Math.SQRT2],
    ['triangle', triangle, 1 / Math.sqrt(3)],
    ['square', square, 1],
  ] as const)('%s RMS matches the closed form', (_name, shape, ratio) => {
    const m = measure(sampled(shape, n, period, { peak: 2.5 }), fs).measurements;
    // RMS of the ideal shape over its peak (sine 1/√2, triangle 1/√3, square 1; any signals handbook).
    expect(m.vrmsAc / 2.5).toBeCloseTo(ratio, 3);
    expect(Math.abs(m.vrmsAc / (2.5 * ratio) - 1)).toBeLessThan(1e-3);
  });

  test('total RMS includes the DC level: √(DC² + AC²)', () => {
    const m = measure(sampled(sine, n, period, { peak: 2, offset: 1.5 }), fs).measurements;
    // Definition of RMS: DC and AC parts add in quadrature (handbook).
    expect(Math.abs(m.vrms - Math.sqrt(1.5 ** 2 + 2 / 1))).toBeLessThan(2e-3);
    expect(Math.abs(m.mean - 1.5)).toBeLessThan(1e-3);
    expect(Math.abs(m.vpp - 4)).toBeLessThan(1e-4);
  });
});

describe('THD (DESIGN §4: harmonics 2…50 over the fundamental)', () => {
  // Fourier series of the ideal square: odd harmonics with amplitude 1/k, so
  // THD over harmonics 3…49 is √(Σ 1/k²); the infinite series gives
  // √(π²/8 − 1) ≈ 48.3 % (handbook). The capped sum is what the contract asks.
  const oddSum = (power: number, top: number): number => {
    let s = 0;
    for (let k = 3; k <= top; k += 2) s += 1 / k ** power;
    return Math.sqrt(s);
  };

  test('square: √(Σ odd 1/k²) up to 49, close to the 48.3 % of the full series', () => {
    const m = measure(sampled(square, n, period, { peak: 3 }), fs).measurements;
    const expected = oddSum(2, 49);
    // Fourier series of the ideal square: THD = √(π²/8 − 1) ≈ 48.3 % (any signals handbook).
    expect(Math.sqrt(Math.PI ** 2 / 8 - 1)).toBeCloseTo(0.483, 3);
    // 0.5 % relative: sampling an ideal edge aliases a little energy.
    expect(Math.abs((m.thd ?? 0) / expected - 1)).toBeLessThan(5e-3);
    expect(m.thd).toBeGreaterThan(0.46);
    expect(m.thd).toBeLessThan(0.49);
  });

  test('triangle: √(π⁴/96 − 1) ≈ 12.1 %', () => {
    const m = measure(sampled(triangle, n, period), fs).measurements;
    // Fourier series of the triangle: odd harmonics 1/k² (handbook).
    expect(Math.abs((m.thd ?? 0) - Math.sqrt(Math.PI ** 4 / 96 - 1))).toBeLessThan(1e-3);
    expect(Math.abs((m.thd ?? 0) - oddSum(4, 49))).toBeLessThan(5e-4);
  });

  test('a pure sine has THD near zero; a known 2nd and 3rd harmonic are found', () => {
    const pure = measure(sampled(sine, n, period), fs).measurements;
    // A pure sine has no harmonics (Fourier series): only rounding and window leakage remain.
    expect(pure.thd).toBeLessThan(1e-4);
    const mixed = sampled((p) => Math.sin(2 * Math.PI * p) + 0.03 * Math.sin(4 * Math.PI * p) + 0.04 * Math.cos(6 * Math.PI * p), n, period);
    // By construction: √(0.03² + 0.04²) = 0.05.
    expect(Math.abs((measure(mixed, fs).measurements.thd ?? 0) - 0.05)).toBeLessThan(2e-4);
  });
});

describe('frequency', () => {
  test('within 0.1 % with noise, non-integer periods, 10 or more periods (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 20, max: 3000, noNaN: true }),
        fc.integer({ min: 10, max: 40 }),
        fc.constantFrom(sine, square, triangle),
        fc.integer({ min: 1, max: 1e6 }),
        (drawn, periods, shape, seed) => {
          // An ideal square's edges fall between two samples and say no more: its
          // period is known to about one sample over the record, 1/(samples per
          // period × periods) — so 0.1 % needs a record of 1000 samples or more
          // (arithmetic on the sampling, no source). Sines and triangles carry
          // their phase in every sample and are held to 0.1 % from 20 samples a period.
          const samplesPerPeriod = shape === square ? Math.max(drawn, 1000 / periods) : drawn;
          const x = sampled(shape, Math.ceil(samplesPerPeriod * periods), samplesPerPeriod, { noise: 0.05, seed });
          const f = measure(x, fs).measurements.frequency ?? 0;
          expect(Math.abs(f / (fs / samplesPerPeriod) - 1)).toBeLessThan(1e-3);
        },
      ),
      { numRuns: 60 },
    );
  });

  test('the counterexample CI found: an ideal square at 20.02 samples a period over 10 periods', () => {
    // 200 samples: the edges cannot tell 20.02 from 20.00 (see above); the result
    // must still be within half a sample over the record, 0.5 %.
    const x = sampled(square, Math.ceil(20.02231617511367 * 10), 20.02231617511367, { noise: 0.05, seed: 1 });
    const f = measure(x, fs).measurements.frequency ?? 0;
    expect(Math.abs(f / (fs / 20.02231617511367) - 1)).toBeLessThan(5e-3);
  });
});

describe('edges per IEEE Std 181-2011', () => {
  test('a single-pole edge has a 10–90 % transition of ln 9 · τ ≈ 2.197 τ', () => {
    const tau = 3e-6;
    const rate = 20e6;
    const half = 250e-6;
    // The exact RC response to a square drive, settled (10 τ ≪ half period).
    const x = Float64Array.from({ length: Math.round(rate * half * 12.3) }, (_, i) => {
      const t = i / rate + 17e-6;
      const k = Math.floor(t / half);
      const into = t - k * half;
      const level = k % 2 === 0 ? 1 : -1;
      return level - 2 * level * Math.exp(-into / tau);
    });
    const m = measure(x, rate).measurements;
    expect(m.shape).toBe('square');
    // RC edge, 10 % to 90 %: τ·ln(0.9/0.1) = ln 9 · τ (handbook).
    expect(Math.abs((m.rise ?? 0) / (Math.log(9) * tau) - 1)).toBeLessThan(2e-3);
    expect(Math.abs((m.fall ?? 0) / (Math.log(9) * tau) - 1)).toBeLessThan(2e-3);
    expect(m.overshoot).toBeLessThan(1e-3);
    expect(Math.abs((m.duty ?? 0) - 0.5)).toBeLessThan(1e-3);
  });

  test('an asymmetric edge: the fall is measured on the falling edges, not copied from the rise', () => {
    // Invented edges: rising with τ = 2 µs, falling with τ = 6 µs (a pull-up
    // stronger than the pull-down). Each 10–90 % transition is ln 9 · its own τ
    // (single-pole edge, handbook; IEEE Std 181-2011 reference levels).
    const tauRise = 2e-6;
    const tauFall = 6e-6;
    const rate = 20e6;
    const half = 250e-6;
    const x = Float64Array.from({ length: Math.round(rate * half * 12.3) }, (_, i) => {
      const t = i / rate + 17e-6;
      const k = Math.floor(t / half);
      const into = t - k * half;
      const level = k % 2 === 0 ? 1 : -1;
      return level - 2 * level * Math.exp(-into / (level > 0 ? tauRise : tauFall));
    });
    const m = measure(x, rate).measurements;
    // Single-pole edge, 10–90 %: ln 9 · τ (handbook); 0.2 %.
    expect(Math.abs((m.rise ?? 0) / (Math.log(9) * tauRise) - 1)).toBeLessThan(2e-3);
    expect(Math.abs((m.fall ?? 0) / (Math.log(9) * tauFall) - 1)).toBeLessThan(2e-3);
  });

  test('overshoot of a second-order edge is exp(−ζπ/√(1−ζ²)) of the step', () => {
    const zeta = 0.5;
    const wn = 2 * Math.PI * 50e3;
    const wd = wn * Math.sqrt(1 - zeta ** 2);
    const rate = 20e6;
    const half = 200e-6;
    // Underdamped second-order step response (control handbook formula), settled each half period.
    const step = (t: number): number => 1 - Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta ** 2)) * Math.sin(wd * t));
    const x = Float64Array.from({ length: Math.round(rate * half * 10.4) }, (_, i) => {
      const t = i / rate + 3e-6;
      const k = Math.floor(t / half);
      const level = k % 2 === 0 ? 1 : -1;
      return -level + 2 * level * step(t - k * half);
    });
    const m = measure(x, rate).measurements;
    expect(m.shape).toBe('square');
    // ζ = 0.5: exp(−π/√3) ≈ 16.3 % of the amplitude; state levels from the histogram sit on the settled levels.
    expect(Math.abs((m.overshoot ?? 0) - Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta ** 2)))).toBeLessThan(2e-3);
  });

  test('overshoot of a known ringing edge, and the duty of a 30 % square', () => {
    const x = sampled((p) => (p < 0.3 ? 1 : -1), n, period, { peak: 2 });
    const m = measure(x, fs).measurements;
    // By construction: high for 30 % of each period.
    expect(Math.abs((m.duty ?? 0) - 0.3)).toBeLessThan(2e-3);
    const ring = sampled((p) => (p < 0.5 ? 1 + 0.1 * Math.exp(-p * 40) : -1), n, period);
    // By construction: 10 % of the high level on an amplitude of 2 → 5 %.
    expect(Math.abs((measure(ring, fs).measurements.overshoot ?? 0) - 0.05)).toBeLessThan(3e-3);
  });
});

describe('shape, clipping and notch', () => {
  test.each([
    ['sine', sine, 'sine'],
    ['square', square, 'square'],
    ['triangle', triangle, 'triangle'],
    ['sawtooth', (p: number) => 2 * p - 1, 'other'],
  ] as const)('%s is classed as %s', (_name, shape, expected) => {
    const m = measure(sampled(shape, n, period, { noise: 0.01 }), fs).measurements;
    expect(m.shape).toBe(expected);
    expect(m.clipped).toBe(false);
    expect(m.notch).toBe(false);
  });

  test('shape is stable under noise, with no false clipping or notch (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(['sine', sine], ['square', square], ['triangle', triangle]),
        fc.double({ min: 20, max: 2500, noNaN: true }),
        fc.integer({ min: 3, max: 40 }),
        fc.constantFrom(0, 0.01, 0.03, 0.05),
        fc.integer({ min: 1, max: 1e6 }),
        ([name, shape], samplesPerPeriod, periods, noise, seed) => {
          const m = measure(sampled(shape, Math.ceil(samplesPerPeriod * periods), samplesPerPeriod, { noise, seed }), fs).measurements;
          expect(m.shape).toBe(name);
          expect(m.clipped).toBe(false);
          expect(m.notch).toBe(false);
        },
      ),
      { numRuns: 40 },
    );
  });

  test('a 10 % duty square still arms the crossings', () => {
    const m = measure(
      sampled((p) => (p < 0.1 ? 1 : -1), n, period, { noise: 0.01 }),
      fs,
    ).measurements;
    expect(m.shape).toBe('square');
    // By construction: high for 10 % of the period at fs / period.
    expect(Math.abs((m.duty ?? 0) - 0.1)).toBeLessThan(2e-3);
    expect(Math.abs((m.frequency ?? 0) / (fs / period) - 1)).toBeLessThan(1e-4);
  });

  test('a sine clipped at 85 % of its peak has flat tops', () => {
    const m = measure(
      sampled((p) => Math.max(-0.85, Math.min(0.85, sine(p))), n, period, { noise: 0.005 }),
      fs,
    ).measurements;
    expect(m.clipped).toBe(true);
    expect(m.notch).toBe(false);
  });

  test('a dead band of ±12 % of the peak at the crossing is a notch', () => {
    const dead = (p: number): number => {
      const v = sine(p);
      return Math.abs(v) < 0.12 ? 0 : v - Math.sign(v) * 0.12;
    };
    const m = measure(sampled(dead, n, period, { noise: 0.002 }), fs).measurements;
    expect(m.notch).toBe(true);
    expect(m.clipped).toBe(false);
    // The output sits at 0 while |sin| < 0.12: 2·asin(0.12)/(2π) of the period per crossing.
    const flat = (2 * Math.asin(0.12)) / (2 * Math.PI) / (fs / period);
    expect(m.notchTime).toBeGreaterThan(flat);
    expect(m.notchTime).toBeLessThan(flat * 2);
  });
});

describe('captures that cannot be measured', () => {
  test('too short is refused with the reason', () => {
    expect(() => measure(new Float64Array(5), fs)).toThrow(CaptureError);
    expect(() => measure(new Float64Array(5), fs)).toThrow(/only 5 samples/);
  });

  test('a DC level and a capture under two periods give figures but no frequency', () => {
    const dc = measure(new Float64Array(100).fill(11.9), fs).measurements;
    expect(dc.frequency).toBeNull();
    // The invented DC level the capture was written with.
    expect(dc.mean).toBeCloseTo(11.9, 12);
    expect(dc.warnings.join(' ')).toMatch(/flat/);
    const short = measure(sampled(sine, 150, 100), fs).measurements;
    expect(short.frequency).toBeNull();
    expect(short.warnings.join(' ')).toMatch(/fewer than 2 whole periods/);
  });

  test('NaN samples are refused', () => {
    const x = sampled(sine, 1000, 50);
    x[10] = Number.NaN;
    expect(() => measure(x, fs)).toThrow(/sample 11 is NaN/);
  });
});
