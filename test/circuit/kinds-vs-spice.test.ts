import { writeFileSync } from 'node:fs';
import { afterAll, describe, expect, test } from 'vitest';
import { commonEmitterKind } from '../../src/circuit/common-emitter.js';
import { comparatorKind } from '../../src/circuit/comparator.js';
import { mfbBandpassKind, mfbIdeal } from '../../src/circuit/mfb-bandpass.js';
import { defaultDiode } from '../../src/circuit/diode.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { rcHighpassKind } from '../../src/circuit/rc-highpass.js';
import { type RegulatorSettings, regulatorKind } from '../../src/circuit/regulator.js';
import { sallenKeyIdeal } from '../../src/circuit/sallen-key.js';
import { sallenKeyHighpassKind } from '../../src/circuit/sallen-key-highpass.js';
import { sallenKeyLowpassKind } from '../../src/circuit/sallen-key-lowpass.js';
import { timerAstableKind } from '../../src/circuit/timer-astable.js';
import type { Complex, EvalInput, OpampModel, StageKind, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { wienBridgeKind, wienIdeal } from '../../src/circuit/wien-bridge.js';
import { zenerShuntKind } from '../../src/circuit/zener-shunt.js';
import { spiceFigures } from '../helpers/ac-figures.js';
import { corner, runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';
import { spiceWien } from '../helpers/wien-spice.js';

/*
 * Ideal closed form against model against ngspice, per second-set kind, over the
 * cases the kinds' own tests simulate (the same invented parts, the same stated
 * ngspice models: the behavioural op-amp of test/helpers/spice-opamp.ts, the
 * Wien-bridge deck of test/helpers/wien-spice.ts, the decks written out below).
 * Each row asserts the model within the issue's tolerance of ngspice; the table
 * of gaps (the source of docs/kinds-vs-spice.md) is written to the file named by
 * KINDS_VS_SPICE when that variable is set:
 *   KINDS_VS_SPICE=/tmp/gaps.md npx vitest run test/circuit/kinds-vs-spice.test.ts
 */

interface Row {
  readonly kind: string;
  readonly case: string;
  readonly quantity: string;
  readonly ideal: number;
  readonly model: number;
  readonly spice: number;
  /** The issue's tolerance for this quantity (relative). */
  readonly tol: number;
}

const rows: Row[] = [];
const supplies = { pos: 12, neg: -12 };
const rel = (a: number, b: number) => Math.abs(a / b - 1);
const sine = (peak: number, f: number, n = 1024): Waveform => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p), n);

function record(r: Row): void {
  rows.push(r);
  expect(rel(r.model, r.spice), `${r.kind} ${r.case} ${r.quantity}: model ${r.model} against ngspice ${r.spice}`).toBeLessThan(r.tol);
}

function evaluate<S>(kind: StageKind<S>, parts: Record<string, number>, settings: S, extra: Partial<EvalInput<S>> = {}, opamp: OpampModel = defaultOpamp) {
  return kind.evaluate({ parts, settings, opamp, supplies, rails: {}, ...extra }).values;
}

afterAll(() => {
  const file = process.env['KINDS_VS_SPICE'];
  if (!file) return;
  const pct = (a: number, b: number) => `${(100 * (a / b - 1)).toFixed(2)} %`;
  const lines = [
    '| kind | case | quantity | ideal | model | ngspice | ideal − ngspice | model − ngspice |',
    '| --- | --- | --- | --- | --- | --- | --- | --- |',
  ];
  for (const r of rows)
    lines.push(
      `| ${r.kind} | ${r.case} | ${r.quantity} | ${r.ideal.toPrecision(5)} | ${r.model.toPrecision(5)} | ${r.spice.toPrecision(5)} | ${pct(r.ideal, r.spice)} | ${pct(r.model, r.spice)} |`,
    );
  writeFileSync(file, `${lines.join('\n')}\n`);
});

describe('rc-highpass: fc', () => {
  test.each([
    { name: 'unloaded', C: 100e-9, R: 10e3 },
    { name: 'loaded by 10 kΩ', C: 100e-9, R: 10e3, RL: 10e3 },
    { name: 'loaded by 47 kΩ ∥ 1 nF', C: 47e-9, R: 22e3, RL: 47e3, CL: 1e-9 },
  ])('$name', ({ name, C, R, RL, CL }) => {
    const deck = `Vin in 0 DC 0 AC 1\nC1 in out ${C}\nR1 out 0 ${R}${RL ? `\nRL out 0 ${RL}` : ''}${CL ? `\nCL out 0 ${CL}` : ''}`;
    const t = runSpice(deck, 'ac dec 1000 0.1 10meg', ['vm(out)']);
    const spice = corner((t['frequency'] as Float64Array).slice().reverse(), (t['vm(out)'] as Float64Array).slice().reverse());
    const load = RL
      ? (_o: string, f: number): Complex => {
          const yi = 2 * Math.PI * f * (CL ?? 0);
          const d = 1 / RL ** 2 + yi * yi;
          return { re: 1 / RL / d, im: -yi / d };
        }
      : undefined;
    const model = evaluate(rcHighpassKind, { C, R }, {}, { input: sine(1, 1000), load })['fc'] as number;
    record({ kind: 'rc-highpass', case: name, quantity: 'fc', ideal: 1 / (2 * Math.PI * R * C), model, spice, tol: 0.01 });
  });
});

const fastSk: OpampModel = { gbw: 10e6, slew: 10e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const slowSk: OpampModel = { gbw: 200e3, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };

function skDeck(variant: 'lowpass' | 'highpass', p: Record<string, number>, op: OpampModel): string {
  const amp = p['Rf'] !== undefined ? `Rf out n ${p['Rf']}\nRg n 0 ${p['Rg']}\nX1 p n out opa` : 'X1 p out out opa';
  const net =
    variant === 'lowpass'
      ? [`R1 in a ${p['R1']}`, `R2 a p ${p['R2']}`, `C1 a out ${p['C1']}`, `C2 p 0 ${p['C2']}`]
      : [`C1 in a ${p['C1']}`, `C2 a p ${p['C2']}`, `R1 a out ${p['R1']}`, `R2 p 0 ${p['R2']}`];
  return [opampSubcktFor('opa', op, supplies), 'Vin in 0 DC 0 AC 1', ...net, amp].join('\n');
}

describe.each([
  {
    variant: 'lowpass' as const,
    kind: sallenKeyLowpassKind,
    cases: [
      { name: 'Q 0.5, follower', parts: { R1: 10e3, R2: 10e3, C1: 10e-9, C2: 10e-9 }, op: fastSk, tol: 0.01 },
      { name: 'Q 0.707, follower', parts: { R1: 12e3, R2: 12e3, C1: 22e-9, C2: 11e-9 }, op: fastSk, tol: 0.01 },
      { name: 'Q 2, K 2.5', parts: { R1: 4.7e3, R2: 4.7e3, C1: 4.7e-9, C2: 4.7e-9, Rf: 15e3, Rg: 10e3 }, op: fastSk, tol: 0.01 },
      { name: 'Q 2, K 2.5, GBW 9·f0', parts: { R1: 3.3e3, R2: 3.3e3, C1: 2.2e-9, C2: 2.2e-9, Rf: 15e3, Rg: 10e3 }, op: slowSk, tol: 0.03 },
    ],
  },
  {
    variant: 'highpass' as const,
    kind: sallenKeyHighpassKind,
    cases: [
      { name: 'Q 0.5, follower', parts: { C1: 10e-9, C2: 10e-9, R1: 10e3, R2: 10e3 }, op: fastSk, tol: 0.01 },
      { name: 'Q 0.707, follower', parts: { C1: 22e-9, C2: 22e-9, R1: 5.6e3, R2: 11.2e3 }, op: fastSk, tol: 0.01 },
      { name: 'Q 2, K 2.5', parts: { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 }, op: fastSk, tol: 0.01 },
      { name: 'Q 2, K 2.5, GBW 200 kHz', parts: { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 }, op: slowSk, tol: 0.03 },
    ],
  },
])('sallen-key-$variant: f0 and Q', ({ variant, kind, cases }) => {
  test.each(cases)('$name', ({ name, parts, op, tol }) => {
    const p = parts as Record<string, number>;
    const k = p['Rf'] !== undefined ? 1 + (p['Rf'] as number) / (p['Rg'] as number) : 1;
    const ideal = sallenKeyIdeal(variant, p, k);
    const t = runSpice(skDeck(variant, p, op), `ac dec 1000 ${ideal.f0 / 1000} ${ideal.f0 * 1000}`, ['vr(out)', 'vi(out)']);
    const s = spiceFigures(t, variant);
    const v = evaluate(kind as StageKind<{ hasGain: boolean }>, p, { hasGain: p['Rf'] !== undefined }, { input: sine(0.01, 100) }, op);
    // DESIGN's q is |H(f0)|/gain; the high-pass reads its gain at 30·f0, where |H| = K·900/|899 − 30j/Q| (ideal).
    const top = variant === 'highpass' ? 900 / Math.hypot(899, 30 / ideal.q) : 1;
    record({ kind: `sallen-key-${variant}`, case: name, quantity: 'f0', ideal: ideal.f0, model: v['f0'] as number, spice: s.f0, tol });
    record({ kind: `sallen-key-${variant}`, case: name, quantity: 'q', ideal: ideal.q / top, model: v['q'] as number, spice: s.q, tol });
  });
});

describe('mfb-bandpass: f0, Q and gain', () => {
  const fast: OpampModel = { gbw: 100e6, slew: 20e6, headroom: 1.5, maxSupply: 15, aol: 1e6 };
  const slow: OpampModel = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
  const highQ = { R1: 68e3, R2: 1e3, R3: 270e3, C1: 1e-9, C2: 1e-9 };
  test.each([
    { name: 'Q 0.7', parts: { R1: 22e3, R2: 24e3, R3: 22e3, C1: 10e-9, C2: 10e-9 }, op: fast, tol: 0.01 },
    { name: 'Q 2', parts: { R1: 30e3, R2: 4.7e3, R3: 62e3, C1: 10e-9, C2: 10e-9 }, op: fast, tol: 0.01 },
    { name: 'Q 8 at 10 kHz', parts: highQ, op: fast, tol: 0.01 },
    { name: 'Q 8 at 10 kHz, GBW 1 MHz', parts: highQ, op: slow, tol: 0.03 },
  ])('$name', ({ name, parts, op, tol }) => {
    const ideal = mfbIdeal(parts);
    const deck = [
      opampSubcktFor('opa', op, supplies),
      'Vin in 0 DC 0 AC 1',
      `R1 in a ${parts.R1}`,
      `R2 a 0 ${parts.R2}`,
      `C1 a n ${parts.C1}`,
      `C2 a out ${parts.C2}`,
      `R3 out n ${parts.R3}`,
      'X1 0 n out opa',
    ].join('\n');
    const s = spiceFigures(runSpice(deck, `ac dec 1000 ${ideal.f0 / 300} ${ideal.f0 * 300}`, ['vr(out)', 'vi(out)']), 'bandpass');
    const v = evaluate(mfbBandpassKind, parts, {}, { input: sine(0.01, 100) }, op);
    record({ kind: 'mfb-bandpass', case: name, quantity: 'f0', ideal: ideal.f0, model: v['f0'] as number, spice: s.f0, tol });
    record({ kind: 'mfb-bandpass', case: name, quantity: 'q', ideal: ideal.q, model: v['q'] as number, spice: s.q, tol });
    record({ kind: 'mfb-bandpass', case: name, quantity: 'gain', ideal: ideal.gain, model: v['gain'] as number, spice: s.gain, tol });
  });
});

describe('regulator: out.dc (behavioural error loop in ngspice, as test/circuit/regulator.test.ts)', () => {
  test.each([
    { name: '5 V from 12 V', vin: 12, r1: 240, r2: 720, neg: false },
    { name: '12 V from 15 V, near dropout', vin: 15, r1: 240, r2: 2.05e3, neg: false },
    { name: '11.8 V wanted from 13 V (in dropout)', vin: 13, r1: 240, r2: 2.05e3, neg: false },
    { name: '−12 V from −15 V', vin: -15, r1: 120, r2: 1.02e3, neg: true },
    { name: '−9.6 V wanted from −11 V (in dropout)', vin: -11, r1: 120, r2: 800, neg: true },
  ])('$name', ({ name, vin, r1, r2, neg }) => {
    const out = neg ? 'Breg out 0 V = max(V(adj) - 1.25, V(in) + 2)\nIadj adj 0 DC 50u' : 'Breg out 0 V = min(V(adj) + 1.25, V(in) - 2)\nIadj 0 adj DC 50u';
    const t = runSpice([`Vin in 0 DC ${vin}`, out, `R1 out adj ${r1}`, `R2 adj 0 ${r2}`].join('\n'), 'op', ['v(out)']);
    const spice = (t['v(out)'] as Float64Array)[0] as number;
    const settings: RegulatorSettings = { from: 'IN', polarity: neg ? '-' : '+', isFixed: false };
    const v = regulatorKind.evaluate({
      parts: { R1: r1, R2: r2, vref: 1.25, iadj: 50e-6, dropout: 2 },
      settings,
      opamp: defaultOpamp,
      supplies,
      rails: { IN: vin },
    }).values;
    // The ideal form: Vref·(1 + R2/R1), no adjust-pin current, no dropout.
    record({ kind: 'regulator', case: name, quantity: 'out.dc', ideal: (neg ? -1 : 1) * 1.25 * (1 + r2 / r1), model: v['out.dc'] as number, spice, tol: 0.02 });
  });
});

describe('zener-shunt: out.dc (junction breakdown in ngspice, as test/circuit/zener-shunt.test.ts)', () => {
  test.each([
    { name: '5.1 V from 12 V, 680 Ω, 10 kΩ load', rail: 12, rs: 680, rload: 10e3, vz: 5.1, rz: 5 },
    { name: '15 V zener carrying 30 mA', rail: 24, rs: 270, vz: 15, rz: 10 },
    { name: 'near dropout: Iz 0.9 mA', rail: 12, rs: 820, rload: 680, vz: 5.1, rz: 5 },
    { name: 'dropped out under 470 Ω', rail: 12, rs: 820, rload: 470, vz: 5.1, rz: 5 },
    { name: '−6.2 V from −15 V', rail: -15, rs: 1e3, rload: 4.7e3, vz: 6.2, rz: 8 },
  ])('$name', ({ name, rail, rs, rload, vz, rz }) => {
    const deck = [
      `Vr rail 0 DC ${rail}`,
      `Rs rail out ${rs}`,
      rail < 0 ? 'Dz out 0 dz' : 'Dz 0 out dz',
      rload ? `Rl out 0 ${rload}` : '',
      `.model dz D (IS=1e-14 N=1 BV=${vz} IBV=1e-5 NBV=0.1 RS=${rz})`,
    ].join('\n');
    const spice = (runSpice(deck, 'op', ['v(out)'])['v(out)'] as Float64Array)[0] as number;
    const parts: Record<string, number> = { Rs: rs, vz, rz, izmin: 1e-3 };
    if (rload) parts['Rload'] = rload;
    const v = zenerShuntKind.evaluate({
      parts,
      settings: { from: 'R', hasLoad: rload !== undefined },
      opamp: defaultOpamp,
      supplies,
      rails: { R: rail },
    }).values;
    // The ideal form: the output sits at the zener voltage.
    record({ kind: 'zener-shunt', case: name, quantity: 'out.dc', ideal: Math.sign(rail) * vz, model: v['out.dc'] as number, spice, tol: 0.02 });
  });
});

describe('wien-bridge: frequency and amplitude (ngspice transient, test/helpers/wien-spice.ts)', () => {
  const op: OpampModel = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
  test.each([
    { name: 'equal arms, 1 kHz, limited', parts: { R1: 15e3, C1: 10e-9, R2: 15e3, C2: 10e-9, Rg: 10e3, Rf1: 15e3, Rf2: 10e3 }, o: op, ftol: 0.01 },
    { name: 'unequal arms, 3.4 kHz, limited', parts: { R1: 10e3, C1: 4.7e-9, R2: 4.7e3, C2: 10e-9, Rg: 4.7e3, Rf1: 15e3, Rf2: 10e3 }, o: op, ftol: 0.01 },
    {
      name: '19 kHz on a 1 MHz op-amp, limited',
      parts: { R1: 8.2e3, C1: 1e-9, R2: 8.2e3, C2: 1e-9, Rg: 10e3, Rf1: 18e3, Rf2: 6.8e3 },
      o: { ...op, slew: 5e6 },
      ftol: 0.03,
    },
    { name: 'no Rf2 (clips at the swing)', parts: { R1: 15e3, C1: 10e-9, R2: 15e3, C2: 10e-9, Rg: 10e3, Rf1: 22e3 }, o: op, ftol: 0.01 },
  ])('$name', ({ name, parts, o, ftol }) => {
    const p = parts as Record<string, number>;
    const s = spiceWien(p, o, supplies);
    const hasLimiter = p['Rf2'] !== undefined;
    const v = wienBridgeKind.evaluate({ parts: p, settings: { hasLimiter, diode: defaultDiode, diodeName: 'test' }, opamp: o, supplies, rails: {} }).values;
    record({ kind: 'wien-bridge', case: name, quantity: 'freq', ideal: wienIdeal(p).f0, model: v['freq'] as number, spice: s.freq, tol: ftol });
    // The ideal form has an amplitude only without the limiter: the op-amp's swing, 2·(12 − 1.5) V.
    record({
      kind: 'wien-bridge',
      case: name,
      quantity: 'out.vpp',
      ideal: hasLimiter ? Number.NaN : 21,
      model: v['out.vpp'] as number,
      spice: s.vpp,
      tol: 0.05,
    });
  });
});

describe('comparator: frequency, duty and output swing (behavioural op-amp)', () => {
  /** Output duty and peak-to-peak over whole periods of a transient (mid-level crossings). */
  function measure(t: Float64Array, v: Float64Array): { duty: number; vpp: number } {
    const hi = Math.max(...v);
    const lo = Math.min(...v);
    const mid = (hi + lo) / 2;
    const rises: number[] = [];
    const falls: number[] = [];
    for (let i = 1; i < v.length; i++) {
      const a = (v[i - 1] as number) - mid;
      const b = (v[i] as number) - mid;
      if (a < 0 !== b < 0) (b > 0 ? rises : falls).push((t[i - 1] as number) + ((t[i] as number) - (t[i - 1] as number)) * (a / (a - b)));
    }
    const r0 = rises[0] as number;
    const period = ((rises[rises.length - 1] as number) - r0) / (rises.length - 1);
    return { duty: ((falls.find((x) => x > r0) as number) - r0) / period, vpp: hi - lo };
  }
  test.each([
    { name: '1 kHz, 2 V reference', f: 1e3, peak: 4, r1: 10e3, r2: 47e3, vref: 2, op: defaultOpamp },
    { name: '10 kHz on 0.5 V/µs', f: 10e3, peak: 5, r1: 10e3, r2: 100e3, vref: 0, op: defaultOpamp },
    { name: '40 kHz on 0.5 V/µs (edges never finish)', f: 40e3, peak: 5, r1: 10e3, r2: 100e3, vref: 0, op: defaultOpamp },
  ])('$name', ({ name, f, peak, r1, r2, vref, op }) => {
    const T = 1 / f;
    const deck = [
      opampSubcktFor('oa', op, supplies),
      `Vin in 0 SIN(0 ${peak} ${f})`,
      `Vr ref 0 DC ${vref}`,
      `R1 ref p ${r1}`,
      `R2 out p ${r2}`,
      'Xc p in out oa',
    ].join('\n');
    const t = runSpice(deck, `tran ${T / 4000} ${40 * T} ${30 * T} ${T / 4000}`, ['v(out)']);
    const s = measure(t['time'] as Float64Array, t['v(out)'] as Float64Array);
    const v = evaluate(comparatorKind, { R1: r1, R2: r2, vref }, { isPeriodic: true }, { input: sine(peak, f, 4096) }, op);
    // The ideal form: thresholds (Vref·R2 ± Vswing·R1)/(R1 + R2), instant edges between ±10.5 V.
    const swing = 10.5;
    const high = (vref * r2 + swing * r1) / (r1 + r2);
    const low = (vref * r2 - swing * r1) / (r1 + r2);
    const duty = (Math.asin(high / peak) + Math.PI + Math.asin(low / peak)) / (2 * Math.PI);
    if (f < 20e3) record({ kind: 'comparator', case: name, quantity: 'duty', ideal: duty, model: v['duty'] as number, spice: s.duty, tol: 0.02 });
    else {
      // Edges that never finish leave a triangle with no level to come back to: it settles off centre, high for d or
      // for 1 − d of the period, whichever way it started (the circuit is symmetric). The model and ngspice pick
      // opposite ways here; compare the fraction on the short side.
      const short = (d: number) => Math.min(d, 1 - d);
      record({
        kind: 'comparator',
        case: name,
        quantity: 'duty, short side',
        ideal: short(duty),
        model: short(v['duty'] as number),
        spice: short(s.duty),
        tol: 0.02,
      });
    }
    record({ kind: 'comparator', case: name, quantity: 'out.vpp', ideal: 2 * swing, model: v['out.vpp'] as number, spice: s.vpp, tol: 0.02 });
  });
});

describe('common-emitter: collector level and gain (Gummel–Poon NPN, as test/circuit/common-emitter.test.ts)', () => {
  const is = 1e-3 * Math.exp(-0.65 / 0.025865);
  const cases = {
    unbypassed: { rail: 12, r1: 47e3, r2: 10e3, rc: 4.7e3, re: 1e3, hfe: 150, vaf: 100 },
    bypassed: { rail: 12, r1: 47e3, r2: 10e3, rc: 4.7e3, re: 1e3, ce: 100e-6, hfe: 150, vaf: 100 },
    lowBeta: { rail: 9, r1: 33e3, r2: 6.8e3, rc: 2.2e3, re: 470, ce: 47e-6, hfe: 60, vaf: 40 },
    nearSaturation: { rail: 12, r1: 33e3, r2: 10e3, rc: 3.3e3, re: 1.2e3, hfe: 200, vaf: 100 },
  } as const;
  type Case = { rail: number; r1: number; r2: number; rc: number; re: number; ce?: number; hfe: number; vaf: number };
  const deck = (c: Case) =>
    [
      `Vcc vcc 0 DC ${c.rail}`,
      `R1 vcc b ${c.r1}`,
      `R2 b 0 ${c.r2}`,
      `Rc vcc c ${c.rc}`,
      `Re e 0 ${c.re}`,
      c.ce ? `Ce e 0 ${c.ce}` : '',
      'Vin in 0 DC 0 AC 1',
      'Cin in b 1',
      'Q1 c b e qn',
      `.model qn NPN (IS=${is} BF=${c.hfe} VAF=${c.vaf})`,
    ].join('\n');
  const model = (c: Case, f: number) => {
    const parts: Record<string, number> = { R1: c.r1, R2: c.r2, Rc: c.rc, Re: c.re, hfe: c.hfe, vbe: 0.65, vaf: c.vaf };
    if (c.ce) parts['Ce'] = c.ce;
    return commonEmitterKind.evaluate({
      parts,
      settings: { from: 'VCC', hasCe: c.ce !== undefined },
      opamp: defaultOpamp,
      supplies,
      rails: { VCC: c.rail },
      input: sine(1e-3, f, 256),
    }).values;
  };
  /** Sedra and Smith's classical bias with Vbe fixed at 0.65 V, no Early effect; gain −Rc/(re + Re), Re bypassed: −Rc/re. */
  const ideal = (c: Case) => {
    const vth = (c.rail * c.r2) / (c.r1 + c.r2);
    const rth = (c.r1 * c.r2) / (c.r1 + c.r2);
    const ic = (c.hfe * (vth - 0.65)) / (rth + (c.hfe + 1) * c.re);
    return { vc: c.rail - ic * c.rc, gain: -c.rc / (0.025865 / ic + (c.ce ? 0 : c.re)) };
  };
  test.each(Object.entries(cases))('operating point: %s', (name, c) => {
    const t = runSpice(deck(c), 'op', ['v(c)']);
    record({
      kind: 'common-emitter',
      case: name,
      quantity: 'vc.dc',
      ideal: ideal(c).vc,
      model: model(c, 1e3)['vc.dc'] as number,
      spice: (t['v(c)'] as Float64Array)[0] as number,
      tol: 0.02,
    });
  });
  test.each([
    ['unbypassed, 1 kHz', cases.unbypassed, 1e3],
    ['bypassed, 1 kHz', cases.bypassed, 1e3],
    ['bypassed, 20 Hz', cases.bypassed, 20],
    ['low hfe, VA 40 V, 1 kHz', cases.lowBeta, 1e3],
  ] as const)('gain: %s', (name, c, f) => {
    const t = runSpice(deck(c), `ac lin 1 ${f} ${f}`, ['vm(c)']);
    const spice = -((t['vm(c)'] as Float64Array)[0] as number);
    record({ kind: 'common-emitter', case: name, quantity: 'gain', ideal: ideal(c).gain, model: model(c, f)['gain'] as number, spice, tol: 0.05 });
  });
});

describe('timer-astable: frequency (behavioural comparators and latch, as test/circuit/timer-astable.test.ts)', () => {
  function spiceFreq(o: { ra: number; rb: number; c: number; rail: number; rcap?: number }): number {
    const T = Math.LN2 * (o.ra + 2 * o.rb) * o.c;
    const deck = [
      `Vcc vcc 0 DC ${o.rail}`,
      `Ra vcc dis ${o.ra}`,
      `Rb dis cap ${o.rb}`,
      `C1 cap 0 ${o.c} IC=0`,
      o.rcap ? `Rcap cap 0 ${o.rcap}` : '',
      'Bs s 0 V = 0.5*(1+tanh((V(vcc)/3 - V(cap))/1m))',
      'Br r 0 V = 0.5*(1+tanh((V(cap) - 2*V(vcc)/3)/1m))',
      'Bq nq 0 V = 0.5*(1 - tanh((V(r) + V(qb) - 0.5)/0.02))',
      'Rq nq q 1k',
      'Cq q 0 1p',
      'Bqb nqb 0 V = 0.5*(1 - tanh((V(s) + V(q) - 0.5)/0.02))',
      'Rqb nqb qb 1k',
      'Cqb qb 0 1p',
      'Bdis dis 0 I = V(dis) * 0.5*(1+tanh((V(qb) - 0.5)/0.01))',
    ].join('\n');
    const t = runSpice(deck, `tran ${T / 5000} ${8 * T} 0 ${T / 5000} uic`, ['v(q)']);
    const time = t['time'] as Float64Array;
    const q = t['v(q)'] as Float64Array;
    const rises: number[] = [];
    for (let i = 1; i < q.length; i++) {
      const a = (q[i - 1] as number) - 0.5;
      const b = (q[i] as number) - 0.5;
      if (a < 0 && b >= 0) rises.push((time[i - 1] as number) + ((time[i] as number) - (time[i - 1] as number)) * (a / (a - b)));
    }
    const r = rises.slice(1);
    return (r.length - 1) / ((r[r.length - 1] as number) - (r[0] as number));
  }
  test.each([
    { name: '1k, 10k, 100 nF at 12 V', ra: 1e3, rb: 10e3, c: 100e-9, rail: 12 },
    { name: '10k, 10k, 10 nF at 9 V', ra: 10e3, rb: 10e3, c: 10e-9, rail: 9 },
    { name: '47k, 2k2, 1 µF at 5 V', ra: 47e3, rb: 2.2e3, c: 1e-6, rail: 5 },
    { name: '10k, 10k, 10 nF, 47 kΩ on the capacitor', ra: 10e3, rb: 10e3, c: 10e-9, rail: 9, rcap: 47e3 },
  ])('$name', ({ name, ra, rb, c, rail, rcap }) => {
    const spice = spiceFreq({ ra, rb, c, rail, ...(rcap ? { rcap } : {}) });
    const load = rcap ? (o: string) => (o === 'cap' ? { re: rcap, im: 0 } : undefined) : undefined;
    const v = timerAstableKind.evaluate({
      parts: { Ra: ra, Rb: rb, C: c, vdrop: 1.7 },
      settings: { from: 'VCC' },
      opamp: defaultOpamp,
      supplies,
      rails: { VCC: rail },
      load,
    }).values;
    record({ kind: 'timer-astable', case: name, quantity: 'freq', ideal: 1 / (Math.LN2 * (ra + 2 * rb) * c), model: v['freq'] as number, spice, tol: 0.01 });
  });
});
