import { describe, expect, test } from 'vitest';
import { sallenKeyHighpassKind } from '../../src/circuit/sallen-key-highpass.js';
import { sallenKeyIdeal } from '../../src/circuit/sallen-key.js';
import { StageParseError } from '../../src/circuit/errors.js';
import type { OpampModel, StageFault, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';
import { spiceFigures } from '../helpers/ac-figures.js';

// Invented op-amps and supplies for the tests (not particular parts).
const fast: OpampModel = { gbw: 50e6, slew: 20e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const slow: OpampModel = { gbw: 200e3, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const supplies = { pos: 12, neg: -12 };
const sine = (peak: number, f: number): Waveform => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p));

type Parts = Record<string, number>;

function run(parts: Parts, input: Waveform, op: OpampModel, fault?: StageFault) {
  return sallenKeyHighpassKind.evaluate({ parts, settings: { hasGain: parts['Rf'] !== undefined }, opamp: op, supplies, rails: {}, input, fault });
}

function deck(parts: Parts, op: OpampModel, source: string): string {
  return [
    opampSubcktFor('opa', op, supplies),
    source,
    `C1 in a ${parts['C1']}`,
    `C2 a p ${parts['C2']}`,
    `R1 a out ${parts['R1']}`,
    `R2 p 0 ${parts['R2']}`,
    parts['Rf'] !== undefined ? `Rf out n ${parts['Rf']}\nRg n 0 ${parts['Rg']}\nX1 p n out opa` : 'X1 p out out opa',
  ].join('\n');
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const kOf = (p: Parts) => (p['Rf'] !== undefined ? 1 + (p['Rf'] as number) / (p['Rg'] as number) : 1);

describe('sallen-key-highpass against ngspice AC (behavioural one-pole op-amp, test/helpers/spice-opamp.ts)', () => {
  // Invented part values. Q near 0.5 (equal parts, follower), 0.707 (R2 = 2·R1, follower), 2 (equal parts, K = 2.5).
  test.each([
    { name: 'Q 0.5, follower', parts: { C1: 10e-9, C2: 10e-9, R1: 10e3, R2: 10e3 }, op: fast, tol: 0.01 },
    { name: 'Q 0.707, follower', parts: { C1: 22e-9, C2: 22e-9, R1: 5.6e3, R2: 11.2e3 }, op: fast, tol: 0.01 },
    { name: 'Q 2, gain 2.5', parts: { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 }, op: fast, tol: 0.01 },
    {
      name: 'Q 2, gain 2.5, GBW 200 kHz (passband at 30·f0 within its reach)',
      parts: { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 },
      op: slow,
      tol: 0.03,
    },
  ])('$name: f0, Q, fc and gain', ({ parts, op, tol }) => {
    const f0i = sallenKeyIdeal('highpass', parts, kOf(parts)).f0;
    const t = runSpice(deck(parts, op, 'Vin in 0 DC 0 AC 1'), `ac dec 1000 ${f0i / 1000} ${f0i * 1000}`, ['vr(out)', 'vi(out)']);
    const s = spiceFigures(t, 'highpass');
    const v = run(parts, sine(0.01, 100), op).values;
    // ngspice AC sweep, 1000 points a decade: within 1 % with a fast op-amp, 3 % where the GBW matters.
    expect(rel(v['f0'] as number, s.f0)).toBeLessThan(tol);
    expect(rel(v['q'] as number, s.q)).toBeLessThan(tol);
    expect(rel(v['fc'] as number, s.fc)).toBeLessThan(tol);
    expect(rel(v['gain'] as number, s.gain)).toBeLessThan(tol);
  });

  test('a triangle at 2·f0 through the Q 2 section: out.vpp against an ngspice transient', () => {
    const parts = { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 };
    const f = 2 * sallenKeyIdeal('highpass', parts, 2.5).f0;
    const T = 1 / f;
    const tt = runSpice(deck(parts, fast, `Vin in 0 PWL(0 0 ${T / 4} 1 ${(3 * T) / 4} -1 ${T} 0) r=0`), `tran ${T / 2000} ${40 * T} ${35 * T} ${T / 2000}`, [
      'v(out)',
    ]);
    const out = tt['v(out)'] as Float64Array;
    const spiceVpp = Math.max(...out) - Math.min(...out);
    const tri = fromPhase(f, (p) => (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4), 1024);
    // ngspice transient, last five of forty periods: within 1 %.
    expect(rel(run(parts, tri, fast).values['out.vpp'] as number, spiceVpp)).toBeLessThan(0.01);
  });
});

describe('sallen-key-highpass closed forms (handbook)', () => {
  test('unity gain, equal parts: Q = 0.5 (op-amp filter literature, equal-component Sallen–Key; from memory)', () => {
    expect(sallenKeyIdeal('highpass', { C1: 10e-9, C2: 10e-9, R1: 10e3, R2: 10e3 }, 1).q).toBeCloseTo(0.5, 12);
    const v = run({ C1: 10e-9, C2: 10e-9, R1: 10e3, R2: 10e3 }, sine(0.01, 100), { ...fast, gbw: 1e10, aol: 1e9 }).values;
    // By DESIGN's definition the gain is read at 30·f0, where |H| = 900/|−899 + 60j| = 0.99889, so q = 0.5/0.99889.
    expect(v['q'] as number).toBeCloseTo(0.5 / (900 / Math.hypot(899, 60)), 4);
    expect(v['gain'] as number).toBeCloseTo(900 / Math.hypot(899, 60), 4);
  });
  test('R2 = 2·R1 with equal capacitors: Butterworth, Q = 1/√2 and fc = f0 (op-amp filter literature; from memory)', () => {
    const v = run({ C1: 22e-9, C2: 22e-9, R1: 5.6e3, R2: 11.2e3 }, sine(0.01, 100), { ...fast, gbw: 1e10, aol: 1e9 }).values;
    expect(v['q'] as number).toBeCloseTo(Math.SQRT1_2, 4);
    expect(rel(v['fc'] as number, v['f0'] as number)).toBeLessThan(1e-4);
  });
  test('worked example: the equal-component VCVS Butterworth, K = 1.586, high-pass as well (Horowitz and Hill, The Art of Electronics; from memory)', () => {
    const parts = { C1: 10e-9, C2: 10e-9, R1: 10e3, R2: 10e3, Rf: 5.86e3, Rg: 10e3 };
    expect(sallenKeyIdeal('highpass', parts, 1.586).q).toBeCloseTo(1 / (3 - 1.586), 12);
    const v = run(parts, sine(0.01, 100), { ...fast, gbw: 1e10, aol: 1e9 }).values;
    // Q = 1/(3 − K) = 0.7072; q as DESIGN reads it (gain at 30·f0) within 0.2 %, and the −3 dB point at f0.
    const top = 900 / Math.hypot(899, 30 * (3 - 1.586));
    expect(rel((v['q'] as number) * top, Math.SQRT1_2)).toBeLessThan(0.002);
    expect(rel(v['fc'] as number, v['f0'] as number)).toBeLessThan(0.002);
  });
});

describe('sallen-key-highpass faults and plan', () => {
  const parts = { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 };
  test('C1 open in a follower: nothing passes (gain 0, output flat)', () => {
    const r = run({ C1: 10e-9, C2: 10e-9, R1: 10e3, R2: 10e3 }, sine(1, 3000), fast, { role: 'C1', mode: 'open' });
    expect(r.values['gain']).toBeCloseTo(0, 6);
    expect(r.values['out.vpp'] as number).toBeLessThan(1e-6);
  });
  test('R2 shorted: the + input is grounded, the output stays at 0 V', () => {
    const r = run(parts, sine(1, 3000), fast, { role: 'R2', mode: 'short' });
    expect(r.values['out.vpp'] as number).toBeLessThan(0.01);
  });
  test('input impedance: 1/(jωC1) + … falls towards R1 ∥ … far above f0; infinite at DC', () => {
    const x = { parts, settings: { hasGain: true }, opamp: { ...fast, gbw: 1e12, aol: 1e9 } };
    expect(sallenKeyHighpassKind.inputImpedance?.(x, 0).re).toBe(Number.POSITIVE_INFINITY);
    const z = sallenKeyHighpassKind.inputImpedance?.(x, 1e6);
    // Far above f0 both capacitors are shorts: the input sees R1 (to the output, ≈ K·V(in)) ∥ R2.
    // Circuit theory: I = V(1 − K)/R1 + V/R2 → Z = 1/((1 − 2.5)/15k + 1/15k) = −30 kΩ (a bootstrapped, negative resistance).
    expect(rel(z?.re ?? 0, -30e3)).toBeLessThan(0.01);
  });
  test.each([
    [{ parts: { C1: '10n', C2: '10n', R1: '10k' } }, /stages\[5\]\.parts\.R2: missing/],
    [{ parts: { C1: '10n', C2: '10n', R1: '10k', R2: '10k', Rg: '10k' } }, /stages\[5\]\.parts\.Rf: missing; gain needs both/],
  ])('%j', (json, message) => {
    const parse = () => sallenKeyHighpassKind.parse({ json, path: 'stages[5]' }, 'x.plan.json');
    expect(parse).toThrow(StageParseError);
    expect(parse).toThrow(message);
  });
});
