import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { sallenKeyIdeal } from '../../src/circuit/sallen-key.js';
import { sallenKeyLowpassKind } from '../../src/circuit/sallen-key-lowpass.js';
import { sallenKeyHighpassKind } from '../../src/circuit/sallen-key-highpass.js';
import { mfbBandpassKind, mfbIdeal } from '../../src/circuit/mfb-bandpass.js';
import type { OpampModel } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';

// A near-ideal op-amp: the solved response must then land on the closed forms.
const ideal: OpampModel = { gbw: 1e13, slew: 1e12, headroom: 1.5, maxSupply: 15, aol: 1e12 };
const supplies = { pos: 12, neg: -12 };
const sine = fromPhase(100, (p) => 0.001 * Math.sin(2 * Math.PI * p));
const rel = (a: number, b: number) => Math.abs(a / b - 1);

/**
 * −3 dB frequency of a second-order low-pass of natural frequency f0 and
 * quality Q: fc = f0·√(1 − 1/(2Q²) + √((1 − 1/(2Q²))² + 1)) (active-filter
 * handbooks, the second-order section; from memory, checked at Q = 1/√2 where
 * fc = f0). The high-pass mirrors it: fc = f0² / fc(low-pass).
 */
function lowpassCorner(f0: number, q: number): number {
  const x = 1 - 1 / (2 * q * q);
  return f0 * Math.sqrt(x + Math.sqrt(x * x + 1));
}

const resistor = fc.double({ min: 1e3, max: 1e5, noNaN: true });
const capacitor = fc.double({ min: 1e-9, max: 1e-7, noNaN: true });

describe('second-order sections on a near-ideal op-amp land on the handbook forms (random invented parts)', () => {
  test('Butterworth check of the corner formula itself: Q = 1/√2 gives fc = f0', () => {
    expect(lowpassCorner(1000, Math.SQRT1_2)).toBeCloseTo(1000, 9);
  });

  test('sallen-key-lowpass: f0, Q, fc, gain', () => {
    fc.assert(
      fc.property(resistor, resistor, capacitor, capacitor, fc.double({ min: 0, max: 1.5, noNaN: true }), (r1, r2, c1, c2, ratio) => {
        const parts = { R1: r1, R2: r2, C1: c1, C2: c2, Rf: ratio * 10e3 + 1e-3, Rg: 10e3 };
        const k = 1 + parts.Rf / parts.Rg;
        const form = sallenKeyIdeal('lowpass', parts, k);
        fc.pre(form.q > 0.3 && form.q < 8);
        const v = sallenKeyLowpassKind.evaluate({ parts, settings: { hasGain: true }, opamp: ideal, supplies, rails: {}, input: sine }).values;
        // Within 1e-5: the model solves the node equations numerically, the forms are exact.
        expect(rel(v['f0'] as number, form.f0)).toBeLessThan(1e-5);
        expect(rel(v['q'] as number, form.q)).toBeLessThan(1e-5);
        expect(rel(v['gain'] as number, k)).toBeLessThan(1e-5);
        expect(rel(v['fc'] as number, lowpassCorner(form.f0, form.q))).toBeLessThan(1e-5);
      }),
      { numRuns: 60 },
    );
  });

  test('sallen-key-highpass: f0, Q and fc (gain read at 30·f0 as DESIGN defines it)', () => {
    fc.assert(
      fc.property(resistor, resistor, capacitor, capacitor, (r1, r2, c1, c2) => {
        const parts = { C1: c1, C2: c2, R1: r1, R2: r2 };
        const form = sallenKeyIdeal('highpass', parts, 1);
        fc.pre(form.q > 0.3 && form.q < 8);
        const v = sallenKeyHighpassKind.evaluate({ parts, settings: { hasGain: false }, opamp: ideal, supplies, rails: {}, input: sine }).values;
        // |H(30·f0)| of the ideal high-pass, s² / (s² + s/Q + 1) at s = j30.
        const top = 900 / Math.hypot(900 - 1, 30 / form.q);
        expect(rel(v['f0'] as number, form.f0)).toBeLessThan(1e-5);
        expect(rel(v['gain'] as number, top)).toBeLessThan(1e-5);
        expect(rel((v['q'] as number) * top, form.q)).toBeLessThan(1e-5);
        // The high-pass's corner is where |H| = top/√2 (not 1/√2): solve s² / (s² + s/Q + 1) for it.
        const want = top / Math.SQRT2;
        let lo = 1e-3;
        let hi = 30;
        for (let i = 0; i < 200; i++) {
          const x = Math.sqrt(lo * hi);
          const m = (x * x) / Math.hypot(1 - x * x, x / form.q);
          if (m < want) lo = x;
          else hi = x;
        }
        expect(rel(v['fc'] as number, form.f0 * Math.sqrt(lo * hi))).toBeLessThan(1e-5);
      }),
      { numRuns: 60 },
    );
  });

  test('mfb-bandpass: f0, Q, bw and gain', () => {
    fc.assert(
      fc.property(resistor, resistor, resistor, capacitor, capacitor, (r1, r2, r3, c1, c2) => {
        const parts = { R1: r1, R2: r2, R3: r3, C1: c1, C2: c2 };
        const form = mfbIdeal(parts);
        fc.pre(form.q > 0.3 && form.q < 20);
        const v = mfbBandpassKind.evaluate({ parts, settings: {}, opamp: ideal, supplies, rails: {}, input: sine }).values;
        expect(rel(v['f0'] as number, form.f0)).toBeLessThan(1e-5);
        expect(rel(v['q'] as number, form.q)).toBeLessThan(1e-5);
        // A second-order band-pass's −3 dB bandwidth is f0/Q exactly (handbook).
        expect(rel(v['bw'] as number, form.f0 / form.q)).toBeLessThan(1e-5);
        expect(rel(v['gain'] as number, form.gain)).toBeLessThan(1e-5);
      }),
      { numRuns: 60 },
    );
  });
});
