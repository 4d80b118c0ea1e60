import { describe, expect, test } from 'vitest';
import { type Diagnosis, diagnose, type DiagnosisReading } from '../../src/analysis/diagnose.js';
import { expectedTrace, nominalOutputs } from '../../src/analysis/expected-trace.js';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target } from '../../src/analysis/types.js';
import { uncertaintyFor, verdictFor } from '../../src/analysis/verdict.js';
import type { OpampModel } from '../../src/circuit/types.js';
import { loadPlanText } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { uncertaintyKey } from '../../src/units/unit.js';
import { spiceWien } from '../helpers/wien-spice.js';

/*
 * Each of the ten second-set kinds (DESIGN §3's second table) through the whole
 * path a technician sees: a small invented plan loads, its targets come out of
 * the tolerance engine (nominal, worst-case and statistical bands), the bring-up
 * screen's expected trace is drawn from the chain, the loading between stages is
 * applied, and a planted fault is diagnosed from readings that come from outside
 * the model: the handbook closed form of the faulted circuit (named beside each),
 * or ngspice where no closed form gives the number (the Wien amplitude).
 */

const common = {
  rails: [
    { id: '+12V', nominal: '12 V', tol: '2%' },
    { id: '-12V', nominal: '-12 V', tol: '2%' },
  ],
  idleCurrent: { max: '50 mA' },
  opamp: { gbw: '10 MHz', slew: '10 V/us', headroom: '1.5 V', maxSupply: '18 V' },
  uncertainty: { V: '0.5% + 2 mV', A: '1% + 1 uA', Hz: '0.05%', ohm: '1% + 1 ohm', '1': '0.5% + 0.001', 'V/V': '0.5%' },
};
const gen = (frequency: string, peak: string) => ({ id: 'in', kind: 'signal-in', shape: 'sine', peak: `${peak} 0.5%`, frequency: `${frequency} 0.05%` });

function planOf(name: string, stages: readonly object[]): Plan {
  return loadPlanText(JSON.stringify({ plan: `second-set-${name}`, title: `${name} (invented test board)`, ...common, stages }), `${name}.plan.json`);
}

interface Board {
  readonly plan: Plan;
  readonly targets: readonly Target[];
}

function board(name: string, stages: readonly object[]): Board {
  const plan = planOf(name, stages);
  return { plan, targets: computeTargets(plan, { trials: 2000 }).targets };
}

function target(b: Board, check: string): Target {
  const t = b.targets.find((x) => x.check === check);
  if (!t) throw new Error(`no target ${check}`);
  return t;
}

/** Readings typed at the bench (the rails at nominal), each judged against its band as the bring-up screen does. */
function readings(b: Board, values: Readonly<Record<string, number>>): DiagnosisReading[] {
  const all: Record<string, number> = { 'rails.+12V.dc': 12, 'rails.-12V.dc': -12, ...values };
  return Object.entries(all).map(([check, value]) => {
    const t = target(b, check);
    return { check, value, verdict: verdictFor(t, value, uncertaintyFor(b.plan, check, uncertaintyKey(t.unit))).verdict };
  });
}

/** 1-based rank of the group that names `part` (head or an alternative the readings cannot tell from it), 0 when absent. */
function rankOf(d: Diagnosis, part: string, mode = 'value'): number {
  const i = d.hypotheses.findIndex((h) => (h.part === part && h.mode === mode) || h.alternatives.some((a) => a.part === part && a.mode === mode));
  return i + 1;
}

/** The solved value of `part` in the diagnosis (head or alternative). */
function solvedValue(d: Diagnosis, part: string): number | null {
  for (const h of d.hypotheses) {
    if (h.part === part && h.mode === 'value') return h.value;
    const a = h.alternatives.find((x) => x.part === part && x.mode === 'value');
    if (a) return a.value;
  }
  return null;
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);
/** |H| of a second-order section at f: the handbook forms with s = jf/f0. */
const lowpassMag = (f: number, f0: number, q: number, k: number) => k / Math.hypot(1 - (f / f0) ** 2, f / f0 / q);
const highpassMag = (f: number, f0: number, q: number, k: number) => (k * (f / f0) ** 2) / Math.hypot(1 - (f / f0) ** 2, f / f0 / q);
const bandpassMag = (f: number, f0: number, q: number, k: number) => (Math.abs(k) * (f / f0 / q)) / Math.hypot(1 - (f / f0) ** 2, f / f0 / q);

/** The expected trace of a check, as the bring-up screen and `targets` draw it. */
function traceOf(b: Board, check: string) {
  return expectedTrace(b.plan, b.targets, target(b, check), nominalOutputs(b.plan));
}

/** Every target of the stage: nominal finite, inside the worst-case band, and the statistical band inside that. */
function expectBandsNest(b: Board, stage: string): void {
  const list = b.targets.filter((t) => t.stage === stage && !t.isDesignFigure);
  expect(list.length).toBeGreaterThan(0);
  for (const t of list) {
    expect(Number.isFinite(t.nominal), t.check).toBe(true);
    expect(t.worst.min, t.check).toBeLessThanOrEqual(t.nominal);
    expect(t.worst.max, t.check).toBeGreaterThanOrEqual(t.nominal);
    expect(t.stat.min, t.check).toBeGreaterThanOrEqual(t.worst.min - 1e-12 * Math.abs(t.nominal));
    expect(t.stat.max, t.check).toBeLessThanOrEqual(t.worst.max + 1e-12 * Math.abs(t.nominal));
    expect(t.worst.max, t.check).toBeGreaterThan(t.worst.min);
  }
}

describe('rc-highpass on a board', () => {
  const b = board('rc-highpass', [gen('1 kHz', '1 V'), { id: 'k', kind: 'rc-highpass', input: 'in.out', parts: { C: '10n 5%', R: '10k 1%' } }]);
  test('targets: fc = 1/(2πRC) and its worst-case band at the tolerance corners (handbook first-order form)', () => {
    expectBandsNest(b, 'k');
    const fc = target(b, 'k.fc');
    expect(rel(fc.nominal, 1 / (2 * Math.PI * 10e3 * 10e-9))).toBeLessThan(1e-9);
    expect(rel(fc.worst.max, 1 / (2 * Math.PI * 10e3 * 0.99 * 10e-9 * 0.95))).toBeLessThan(1e-6);
    expect(rel(fc.worst.min, 1 / (2 * Math.PI * 10e3 * 1.01 * 10e-9 * 1.05))).toBeLessThan(1e-6);
    // |H| = (f/fc)/√(1 + (f/fc)²) at 1 kHz, 2 V peak-to-peak in (the waveform's samples catch the peak within 1e-4).
    const x = 1000 / fc.nominal;
    expect(rel(target(b, 'k.out.vpp').nominal, (2 * x) / Math.hypot(1, x))).toBeLessThan(1e-4);
  });
  test('expected trace: the sine leads the input by atan(fc/f) (handbook phase of the first-order high-pass)', () => {
    const t = traceOf(b, 'k.out.vpp');
    expect(t?.output).toBe('k.out');
    expect(t?.frequency).toBe(1000);
    const fc = target(b, 'k.fc').nominal;
    const amp = (target(b, 'k.out.vpp').nominal as number) / 2;
    expect(t?.samples[0] as number).toBeCloseTo(amp * Math.sin(Math.atan(fc / 1000)), 4);
    // The band is the waveform scaled to the out.vpp band's ends.
    const top = Math.max(...(t?.band?.max ?? []));
    expect(rel(2 * top, target(b, 'k.out.vpp').worst.max)).toBeLessThan(0.01);
  });
  test('loading: a 10 kΩ next stage (an inverting amplifier’s Rin) halves the resistance to ground, the corner doubles (circuit theory: R ∥ Rin)', () => {
    const loaded = board('rc-highpass-loaded', [
      gen('1 kHz', '1 V'),
      { id: 'k', kind: 'rc-highpass', input: 'in.out', parts: { C: '10n 5%', R: '10k 1%' } },
      { id: 'next', kind: 'inverting-amp', input: 'k.out', parts: { Rin: '10k 1%', Rf: '10k 1%' } },
    ]);
    expect(rel(target(loaded, 'k.fc').nominal, 1 / (2 * Math.PI * 5e3 * 10e-9))).toBeLessThan(1e-3);
  });
  test('diagnosis: C fitted 1 nF for 10 nF names C (and R, which the readings cannot tell apart)', () => {
    const fc = 1 / (2 * Math.PI * 10e3 * 1e-9);
    const vpp = (2 * (1000 / fc)) / Math.hypot(1, 1000 / fc);
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.fc': fc, 'k.out.vpp': vpp }));
    expect(rankOf(d, 'k.C')).toBe(1);
    expect(solvedValue(d, 'k.C')).toBeCloseTo(1e-9, 12);
    expect(rankOf(d, 'k.R')).toBe(1);
    expect(d.unexplained).toEqual([]);
  });
});

describe('sallen-key-lowpass on a board', () => {
  const parts = { R1: '10k 1%', R2: '10k 1%', C1: '10n 5%', C2: '10n 5%', Rf: '5k6 1%', Rg: '10k 1%' };
  const b = board('sk-lowpass', [gen('500 Hz', '1 V'), { id: 'k', kind: 'sallen-key-lowpass', input: 'in.out', parts }]);
  const f0 = 1 / (2 * Math.PI * 10e3 * 10e-9);
  test('targets: equal parts, K = 1.56, Q = 1/(3 − K) (Sedra and Smith, the equal-component Sallen–Key; from memory)', () => {
    expectBandsNest(b, 'k');
    // 10 MHz GBW is 6300 × f0: the closed forms within 0.3 %.
    expect(rel(target(b, 'k.f0').nominal, f0)).toBeLessThan(0.003);
    expect(rel(target(b, 'k.q').nominal, 1 / (3 - 1.56))).toBeLessThan(0.003);
    expect(rel(target(b, 'k.gain').nominal, 1.56)).toBeLessThan(0.003);
    expect(rel(target(b, 'k.out.vpp').nominal, 2 * lowpassMag(500, f0, 1 / 1.44, 1.56))).toBeLessThan(0.003);
  });
  test('expected trace: a sine at the input frequency with the out.vpp target', () => {
    const t = traceOf(b, 'k.out.vpp');
    expect(t?.frequency).toBe(500);
    expect(rel(t?.vpp as number, target(b, 'k.out.vpp').nominal)).toBeLessThan(1e-6);
  });
  test('diagnosis: Rf 10k for 5k6 (K = 2, Q = 1) names Rf, with Rg 5k6 as the same ratio', () => {
    const q = 1 / (3 - 2);
    const x = 1 - 1 / (2 * q * q);
    const fc = f0 * Math.sqrt(x + Math.sqrt(x * x + 1));
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.f0': f0, 'k.q': q, 'k.fc': fc, 'k.gain': 2, 'k.out.vpp': 2 * lowpassMag(500, f0, q, 2) }));
    // K = 1 + Rf/Rg: Rf at 10k and Rg at 5k6 give the same ratio; no reading of this stage tells them apart.
    expect(rankOf(d, 'k.Rf')).toBe(1);
    expect(rankOf(d, 'k.Rg')).toBe(1);
    expect(solvedValue(d, 'k.Rf')).toBeCloseTo(10e3, 6);
    expect(solvedValue(d, 'k.Rg')).toBeCloseTo(5.6e3, 6);
  });
});

describe('sallen-key-highpass on a board', () => {
  const b = board('sk-highpass', [
    gen('5 kHz', '1 V'),
    { id: 'k', kind: 'sallen-key-highpass', input: 'in.out', parts: { C1: '10n 5%', C2: '10n 5%', R1: '10k 1%', R2: '10k 1%' } },
  ]);
  const f0 = 1 / (2 * Math.PI * 10e3 * 10e-9);
  test('targets: unity gain, equal parts: Q = 0.5 (op-amp filter literature; from memory) and f0 = 1/(2πRC)', () => {
    expectBandsNest(b, 'k');
    expect(rel(target(b, 'k.f0').nominal, f0)).toBeLessThan(0.003);
    // q as DESIGN defines it: |H(f0)|/gain, gain read at 30·f0.
    const top = highpassMag(30 * f0, f0, 0.5, 1);
    expect(rel(target(b, 'k.q').nominal, 0.5 / top)).toBeLessThan(0.003);
    expect(rel(target(b, 'k.out.vpp').nominal, 2 * highpassMag(5000, f0, 0.5, 1))).toBeLessThan(0.003);
  });
  test('expected trace at the output', () => {
    const t = traceOf(b, 'k.out.vpp');
    expect(t?.output).toBe('k.out');
    expect(rel(t?.vpp as number, target(b, 'k.out.vpp').nominal)).toBeLessThan(1e-6);
  });
  test('diagnosis: R1 fitted 1k for 10k (f0 √10 higher, Q = √(R2/R1)/2 = 1.58) names R1', () => {
    const f1 = 1 / (2 * Math.PI * Math.sqrt(1e3 * 10e3) * 10e-9);
    const q = Math.sqrt(10) / 2;
    const top = highpassMag(30 * f1, f1, q, 1);
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.f0': f1, 'k.q': q / top, 'k.out.vpp': 2 * highpassMag(5000, f1, q, 1) }));
    expect(d.hypotheses[0]?.part).toBe('k.R1');
    expect(d.hypotheses[0]?.value).toBeCloseTo(1e3, 6);
  });
});

describe('mfb-bandpass on a board', () => {
  const b = board('mfb', [
    gen('1 kHz', '0.5 V'),
    { id: 'k', kind: 'mfb-bandpass', input: 'in.out', parts: { R1: '30k 1%', R2: '4k7 1%', R3: '62k 1%', C1: '10n 5%', C2: '10n 5%' } },
  ]);
  /** The MFB band-pass forms of DESIGN §3 (op-amp filter literature; from memory). */
  const forms = (r1: number, r2: number, r3: number, c: number) => {
    const f0 = Math.sqrt((r1 + r2) / (r1 * r2 * r3 * c * c)) / (2 * Math.PI);
    return { f0, q: Math.PI * f0 * r3 * c, gain: -r3 / (2 * r1) };
  };
  test('targets against the closed forms, and the worst-case f0 at the corners', () => {
    expectBandsNest(b, 'k');
    const h = forms(30e3, 4.7e3, 62e3, 10e-9);
    expect(rel(target(b, 'k.f0').nominal, h.f0)).toBeLessThan(0.003);
    expect(rel(target(b, 'k.q').nominal, h.q)).toBeLessThan(0.01);
    expect(rel(target(b, 'k.gain').nominal, h.gain)).toBeLessThan(0.01);
    // f0 falls with every part: its band ends are the all-high and all-low corners.
    const lo = Math.sqrt((30e3 * 1.01 + 4.7e3 * 1.01) / (30e3 * 1.01 * 4.7e3 * 1.01 * 62e3 * 1.01 * (10e-9 * 1.05) ** 2)) / (2 * Math.PI);
    expect(rel(target(b, 'k.f0').worst.min, lo)).toBeLessThan(0.003);
  });
  test('expected trace: the inverted sine at f0 (gain negative: the output starts going down)', () => {
    const t = traceOf(b, 'k.out.vpp');
    expect(t?.frequency).toBe(1000);
    const s = t?.samples as Float64Array;
    // The input starts rising at phase 0; near f0 the section inverts, so a quarter period in the output is near its minimum.
    expect(s[Math.floor(s.length / 8)] as number).toBeLessThan(0);
  });
  test('diagnosis: R2 fitted 47k for 4k7 (decade slip) names R2', () => {
    const h = forms(30e3, 47e3, 62e3, 10e-9);
    const vpp = 2 * 0.5 * bandpassMag(1000, h.f0, h.q, h.gain);
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.f0': h.f0, 'k.q': h.q, 'k.bw': h.f0 / h.q, 'k.gain': h.gain, 'k.out.vpp': vpp }));
    expect(d.hypotheses[0]?.part).toBe('k.R2');
    expect(d.hypotheses[0]?.value).toBeCloseTo(47e3, 6);
  });
});

describe('regulator on a board', () => {
  const b = board('regulator', [{ id: 'k', kind: 'regulator', from: '+12V', parts: { R1: '240 1%', R2: '720 1%' } }]);
  // The adjustable regulators' data-sheet form: Vout = Vref·(1 + R2/R1) + Iadj·R2 (from memory).
  const vout = (vref: number, r1: number, r2: number) => vref * (1 + r2 / r1) + 50e-6 * r2;
  test('targets: the data-sheet form, and its worst case at the corners (vref 4 %, R 1 %)', () => {
    expectBandsNest(b, 'k');
    const t = target(b, 'k.out.dc');
    expect(t.nominal).toBeCloseTo(vout(1.25, 240, 720), 9);
    expect(t.worst.max).toBeCloseTo(vout(1.25 * 1.04, 240 * 0.99, 720 * 1.01), 6);
    expect(t.worst.min).toBeCloseTo(vout(1.25 * 0.96, 240 * 1.01, 720 * 0.99), 6);
  });
  test('a DC level draws no trace (nothing periodic at the test point)', () => {
    expect(traceOf(b, 'k.out.dc')).toBeNull();
  });
  test('diagnosis: R2 from the wrong reel (1k5) names R2 and never the regulator’s own reference', () => {
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.out.dc': vout(1.25, 240, 1500) }));
    expect(d.hypotheses[0]?.part).toBe('k.R2');
    expect(d.hypotheses[0]?.value).toBeCloseTo(1500, 6);
    expect(d.hypotheses.flatMap((h) => [h.part, ...h.alternatives.map((a) => a.part)])).not.toContain('k.vref');
  });
  test('diagnosis: R2 shorted reads the reference, 1.25 V: R2 is named, the reference is not', () => {
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.out.dc': 1.25 }));
    expect(d.hypotheses[0]?.part).toBe('k.R2');
    expect(rankOf(d, 'k.R2', 'short')).toBeGreaterThan(0);
    expect(d.hypotheses.flatMap((h) => [h.part, ...h.alternatives.map((a) => a.part)])).not.toContain('k.vref');
  });
});

describe('zener-shunt on a board', () => {
  const b = board('zener', [{ id: 'k', kind: 'zener-shunt', from: '+12V', parts: { Rs: '680 1%' }, vz: '5.1 V 2%', rz: '5 ohm' }]);
  // Sedra and Smith, the zener shunt regulator: Vout = Vz0 + rz·Iz, Iz = (V − Vz0)/(Rs + rz) with no load.
  const shunt = (v: number, rs: number) => {
    const iz = (v - 5.1) / (rs + 5);
    return { vout: 5.1 + 5 * iz, iz };
  };
  test('targets: the shunt-regulator form', () => {
    expectBandsNest(b, 'k');
    const h = shunt(12, 680);
    expect(target(b, 'k.out.dc').nominal).toBeCloseTo(h.vout, 6);
    expect(rel(target(b, 'k.iz').nominal, h.iz)).toBeLessThan(1e-6);
  });
  test('loading: a 1 kΩ next stage (an inverting amplifier’s Rin) takes its current from the zener (Iz falls by about Vout/1k)', () => {
    const loaded = board('zener-loaded', [
      { id: 'k', kind: 'zener-shunt', from: '+12V', parts: { Rs: '680 1%' }, vz: '5.1 V 2%', rz: '5 ohm' },
      { id: 'next', kind: 'inverting-amp', input: 'k.out', parts: { Rin: '1k 1%', Rf: '1k 1%' } },
    ]);
    // Node equation by hand: (12 − V)/680 = (V − 5.1)/5 + V/1000.
    const v = (12 / 680 + 5.1 / 5) / (1 / 680 + 1 / 5 + 1 / 1000);
    expect(target(loaded, 'k.out.dc').nominal).toBeCloseTo(v, 4);
    expect(rel(target(loaded, 'k.iz').nominal, (v - 5.1) / 5)).toBeLessThan(1e-3);
  });
  test('diagnosis: Rs fitted 6k8 for 680 Ω starves the zener; Rs is named', () => {
    const h = shunt(12, 6800);
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.out.dc': h.vout, 'k.iz': h.iz }));
    expect(d.hypotheses[0]?.part).toBe('k.Rs');
    expect(d.hypotheses[0]?.value).toBeCloseTo(6800, 6);
    expect(d.hypotheses.flatMap((h) => [h.part, ...h.alternatives.map((a) => a.part)])).not.toContain('k.rz');
  });
});

describe('wien-bridge on a board', () => {
  const parts = { R1: '10k 1%', C1: '10n 5%', R2: '10k 1%', C2: '10n 5%', Rg: '10k 1%', Rf1: '15k 1%', Rf2: '10k 1%' };
  const b = board('wien', [{ id: 'k', kind: 'wien-bridge', parts }]);
  const op: OpampModel = { gbw: 10e6, slew: 10e6, headroom: 1.5, maxSupply: 18, aol: 2e5 };
  test('targets: f0 = 1/(2πRC) (Sedra and Smith; from memory) within the model’s 1.5 % (the limiter’s harmonics pull it down)', () => {
    expectBandsNest(b, 'k');
    expect(rel(target(b, 'k.freq').nominal, 1 / (2 * Math.PI * 10e3 * 10e-9))).toBeLessThan(0.015);
  });
  test('expected trace: the settled sine at the oscillator’s own frequency, inside its band', () => {
    const t = traceOf(b, 'k.out.vpp');
    expect(rel(t?.frequency as number, target(b, 'k.freq').nominal)).toBeLessThan(1e-9);
    expect(rel(t?.vpp as number, target(b, 'k.out.vpp').nominal)).toBeLessThan(1e-6);
    expect(t?.band).toBeDefined();
  });
  test('diagnosis: C2 fitted 12n for 10n, read off an ngspice board (frequency and amplitude) names C2, not C1', () => {
    const s = spiceWien({ R1: 10e3, C1: 10e-9, R2: 10e3, C2: 12e-9, Rg: 10e3, Rf1: 15e3, Rf2: 10e3 }, op, { pos: 12, neg: -12 });
    // The ideal form for the faulted board, as a cross-check of the simulated one: 1/(2π·10k·√(10n·12n)) = 1453 Hz.
    expect(rel(s.freq, 1 / (2 * Math.PI * 10e3 * Math.sqrt(120e-18)))).toBeLessThan(0.015);
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.freq': s.freq, 'k.out.vpp': s.vpp }));
    expect(d.hypotheses[0]?.part).toBe('k.C2');
    expect(rankOf(d, 'k.C1')).not.toBe(1);
  });
});

describe('comparator on a board', () => {
  const b = board('comparator', [
    gen('1 kHz', '3 V'),
    { id: 'k', kind: 'comparator', input: 'in.out', parts: { R1: '10k 1%', R2: '100k 1%' }, vref: '1 V 1%' },
  ]);
  const swing = 12 - 1.5;
  // Sedra and Smith, the inverting bistable with a reference: V± = (Vref·R2 ± Vswing·R1)/(R1 + R2).
  const th = (r1: number, r2: number) => ({ high: (1 * r2 + swing * r1) / (r1 + r2), low: (1 * r2 - swing * r1) / (r1 + r2) });
  /** Fraction of the period the inverting comparator's output is high for 3 V·sin: from the fall through V− to the rise through V+. */
  const duty = (t: { high: number; low: number }) => {
    const up = Math.asin(t.high / 3);
    const down = Math.PI - Math.asin(t.low / 3);
    return (up + 2 * Math.PI - down) / (2 * Math.PI);
  };
  test('targets: thresholds, hysteresis and duty from the closed form', () => {
    expectBandsNest(b, 'k');
    const t = th(10e3, 100e3);
    expect(target(b, 'k.vth.high').nominal).toBeCloseTo(t.high, 6);
    expect(target(b, 'k.vth.low').nominal).toBeCloseTo(t.low, 6);
    expect(target(b, 'k.freq').nominal).toBeCloseTo(1000, 6);
    // The 10 V/µs edges (2.1 µs for 21 V) are symmetric about the mid level: the duty within 0.002.
    expect(Math.abs(target(b, 'k.duty').nominal - duty(t))).toBeLessThan(0.002);
  });
  test('expected trace: a square at the swing, high for the duty', () => {
    const t = traceOf(b, 'k.out.vpp');
    const s = t?.samples as Float64Array;
    expect(Math.max(...s)).toBeCloseTo(swing, 6);
    expect(Math.min(...s)).toBeCloseTo(-swing, 6);
    const high = s.filter((v) => v > 0).length / s.length;
    expect(Math.abs(high - target(b, 'k.duty').nominal)).toBeLessThan(0.01);
  });
  test('diagnosis: R2 fitted 47k for 100k (wider hysteresis) names R2', () => {
    const t = th(10e3, 47e3);
    const d = diagnose(
      b.plan,
      b.targets,
      readings(b, { 'k.vth.high': t.high, 'k.vth.low': t.low, 'k.hysteresis': t.high - t.low, 'k.freq': 1000, 'k.duty': duty(t) }),
    );
    expect(d.hypotheses[0]?.part).toBe('k.R2');
    expect(d.hypotheses[0]?.value).toBeCloseTo(47e3, 6);
  });
});

describe('common-emitter on a board', () => {
  const b = board('ce', [
    gen('1 kHz', '20 mV'),
    { id: 'k', kind: 'common-emitter', input: 'in.out', from: '+12V', parts: { R1: '47k 1%', R2: '10k 1%', Rc: '4k7 1%', Re: '1k 1%' } },
  ]);
  /**
   * Sedra and Smith's classical bias: Ic = hfe·(Vth − Vbe)/(Rth + (hfe + 1)·Re), with Vbe = 0.65 V + Vt·ln(Ic/1 mA)
   * (the Shockley law, Vt = 25.865 mV at 27 °C) iterated to a fixed point; gain −Rc/(re + Re), re = Vt/Ic.
   */
  const bias = (re: number, hfe = 150) => {
    const vth = (12 * 10e3) / 57e3;
    const rth = (47e3 * 10e3) / 57e3;
    let ic = 1e-3;
    for (let i = 0; i < 50; i++) ic = (hfe * (vth - (0.65 + 0.025865 * Math.log(ic / 1e-3)))) / (rth + (hfe + 1) * re);
    const ve = (ic * (hfe + 1) * re) / hfe;
    const vbe = 0.65 + 0.025865 * Math.log(ic / 1e-3);
    return { ic, ve, vb: ve + vbe, vc: 12 - ic * 4.7e3, gain: -4.7e3 / (0.025865 / ic + re) };
  };
  test('targets: the classical bias and gain (Early effect within 2 %)', () => {
    expectBandsNest(b, 'k');
    const h = bias(1e3);
    expect(rel(target(b, 'k.ic').nominal, h.ic)).toBeLessThan(0.01);
    expect(rel(target(b, 'k.vc.dc').nominal, h.vc)).toBeLessThan(0.01);
    expect(rel(target(b, 'k.gain').nominal, h.gain)).toBeLessThan(0.02);
  });
  test('expected trace: the inverted, amplified sine around the collector level', () => {
    const t = traceOf(b, 'k.out.vpp');
    const s = t?.samples as Float64Array;
    expect(rel(t?.vpp as number, target(b, 'k.out.vpp').nominal)).toBeLessThan(1e-6);
    // Inverting: a quarter period in (input at its peak) the collector is at its lowest.
    expect(s[Math.floor(s.length / 8)] as number).toBeLessThan(target(b, 'k.vc.dc').nominal);
  });
  test('loading: a 4.7 kΩ next stage (an inverting amplifier’s Rin) on the collector halves the gain (Rc ∥ Rload, circuit theory)', () => {
    const loaded = board('ce-loaded', [
      gen('1 kHz', '20 mV'),
      { id: 'k', kind: 'common-emitter', input: 'in.out', from: '+12V', parts: { R1: '47k 1%', R2: '10k 1%', Rc: '4k7 1%', Re: '1k 1%' } },
      { id: 'next', kind: 'inverting-amp', input: 'k.out', parts: { Rin: '4k7 1%', Rf: '4k7 1%' } },
    ]);
    expect(rel(target(loaded, 'k.gain').nominal / target(b, 'k.gain').nominal, 0.5)).toBeLessThan(0.02);
  });
  test('loading: its input, R1 ∥ R2 ∥ (hfe + 1)(re + Re) at the operating point, sets a coupling high-pass’s corner (Sedra and Smith, input resistance of the CE stage with Re)', () => {
    const coupled = board('ce-coupled', [
      gen('1 kHz', '20 mV'),
      { id: 'hp', kind: 'rc-highpass', input: 'in.out', parts: { C: '1u 5%', R: '10k 1%' } },
      { id: 'k', kind: 'common-emitter', input: 'hp.out', from: '+12V', parts: { R1: '47k 1%', R2: '10k 1%', Rc: '4k7 1%', Re: '1k 1%' } },
    ]);
    const h = bias(1e3);
    const rin = 1 / (1 / 47e3 + 1 / 10e3 + 1 / (151 * (0.025865 / h.ic + 1e3)));
    const r = 1 / (1 / 10e3 + 1 / rin);
    // Within 1 %: the Early effect and the bias network's own loading move Rin by a few tenths of a percent.
    expect(rel(target(coupled, 'hp.fc').nominal, 1 / (2 * Math.PI * r * 1e-6))).toBeLessThan(0.01);
  });
  test('diagnosis: Re fitted 10k for 1k (decade slip) names Re', () => {
    const h = bias(10e3);
    const d = diagnose(
      b.plan,
      b.targets,
      readings(b, { 'k.vb.dc': h.vb, 'k.ve.dc': h.ve, 'k.vc.dc': h.vc, 'k.ic': h.ic, 'k.gain': h.gain, 'k.out.vpp': Math.abs(h.gain) * 0.04 }),
    );
    expect(d.hypotheses[0]?.part).toBe('k.Re');
    expect(d.hypotheses[0]?.value).toBeCloseTo(10e3, 6);
  });
});

describe('timer-astable on a board', () => {
  const b = board('timer', [{ id: 'k', kind: 'timer-astable', from: '+12V', parts: { Ra: '1k 1%', Rb: '10k 1%', C: '100n 5%' } }]);
  // The timer data sheets' ln 2 forms (from memory): f = 1/(ln 2·(Ra + 2Rb)·C), duty = (Ra + Rb)/(Ra + 2Rb).
  const f = (ra: number, rb: number, c: number) => 1 / (Math.LN2 * (ra + 2 * rb) * c);
  test('targets: the ln 2 form and its worst case at the corners', () => {
    expectBandsNest(b, 'k');
    const t = target(b, 'k.freq');
    expect(t.nominal).toBeCloseTo(f(1e3, 10e3, 100e-9), 6);
    expect(rel(t.worst.max, f(0.99e3, 9.9e3, 95e-9))).toBeLessThan(1e-6);
    expect(rel(t.worst.min, f(1.01e3, 10.1e3, 105e-9))).toBeLessThan(1e-6);
    // The capacitor between 1/3 and 2/3 of the rail.
    expect(target(b, 'k.cap.vpp').nominal).toBeCloseTo(4, 6);
  });
  test('expected traces: the output high for the duty, the capacitor between 4 V and 8 V', () => {
    const out = traceOf(b, 'k.out.vpp');
    const s = out?.samples as Float64Array;
    const high = s.filter((v) => v > 5).length / s.length;
    expect(Math.abs(high - 11 / 21)).toBeLessThan(0.01);
    const cap = traceOf(b, 'k.cap.vpp');
    expect(cap?.output).toBe('k.cap');
    expect(Math.min(...(cap?.samples ?? []))).toBeCloseTo(4, 1);
    expect(Math.max(...(cap?.samples ?? []))).toBeCloseTo(8, 1);
  });
  test('diagnosis: Rb fitted 1k for 10k names Rb (the duty tells it from C)', () => {
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.freq': f(1e3, 1e3, 100e-9), 'k.duty': 2 / 3 }));
    expect(d.hypotheses[0]?.part).toBe('k.Rb');
    expect(d.hypotheses[0]?.value).toBeCloseTo(1e3, 6);
    expect(d.hypotheses.flatMap((h) => [h.part, ...h.alternatives.map((a) => a.part)])).not.toContain('k.vdrop');
  });
});

describe('what the diagnosis asks for next', () => {
  test('never a design figure nobody probes: for a regulator stuck at its input less the dropout it says to check R1 and R2 in place, not to read its dissipation', () => {
    const b = board('regulator-next', [
      { id: 'k', kind: 'regulator', from: '+12V', parts: { R1: '240 1%', R2: '720 1%' } },
      { id: 'z', kind: 'zener-shunt', from: '+12V', parts: { Rs: '680 1%' }, vz: '5.1 V 2%' },
    ]);
    // In dropout (12 V − 2 V): R1 a decade low, R2 a decade high, either one open all read 10 V (the data-sheet dropout).
    const d = diagnose(b.plan, b.targets, readings(b, { 'k.out.dc': 10 }));
    const designFigures = b.targets.filter((t) => t.isDesignFigure).map((t) => t.check);
    expect(designFigures).toEqual(expect.arrayContaining(['k.pdiss', 'z.pz']));
    for (const h of d.hypotheses) for (const check of designFigures) expect(h.separate ?? '').not.toContain(`read ${check}`);
    expect(d.hypotheses[0]?.separate).toMatch(/no check of the plan tells/);
    if (d.next) expect(designFigures).not.toContain(d.next.check);
  });
});
