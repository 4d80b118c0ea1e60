import { describe, expect, test } from 'vitest';
import { pushPullKind, type PushPullSettings } from '../../src/circuit/push-pull.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import type { Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';
import { runSpice } from '../helpers/ngspice.js';

/**
 * SPICE models of the 2N3904 and 2N3906 as widely distributed in vendor and hobby
 * model libraries, typed from memory (DC parameters and the usual extras).
 */
const bjtModels = [
  '.model Q2N3904 NPN (IS=6.734f XTI=3 EG=1.11 VAF=74.03 BF=416.4 NE=1.259 ISE=6.734f IKF=66.78m XTB=1.5 BR=.7371 NC=2 ISC=0 IKR=0 RC=1 CJC=3.638p MJC=.3085 VJC=.75 FC=.5 CJE=4.493p MJE=.2593 VJE=.75 TR=239.5n TF=301.2p ITF=.4 VTF=4 XTF=2 RB=10)',
  '.model Q2N3906 PNP (IS=1.41f XTI=3 EG=1.11 VAF=18.7 BF=180.7 NE=1.5 ISE=0 IKF=80m XTB=1.5 BR=4.977 NC=2 ISC=0 IKR=0 RC=2.5 CJC=9.728p MJC=.5776 VJC=.75 FC=.5 CJE=8.063p MJE=.3677 VJE=.75 TR=33.42n TF=179.3p ITF=.4 VTF=4 XTF=6 RB=10)',
  // The 1N4148 model of data/diode-models.json, for the bias diodes.
  '.model D1N4148 D (IS=2.52n N=1.752 RS=0.568)',
].join('\n');

const rails = 'Vp vp 0 DC 12\nVn vn 0 DC -12\nRload out 0 1k';
const unbiased = `${bjtModels}\n${rails}\nVin in 0 DC 0\nQ1 vp in out Q2N3904\nQ2 vn in out Q2N3906`;
// Diode bias: 4k7 from each rail feeds two diodes between the bases; the input drives their middle.
const diodeBiased = `${bjtModels}\n${rails}\nVin in 0 DC 0\nRb1 vp bn 4.7k\nD1 bn in D1N4148\nD2 in bp D1N4148\nRb2 bp vn 4.7k\nQ1 vp bn out Q2N3904\nQ2 vn bp out Q2N3906`;

function sweep(netlist: string): { vin: Float64Array; vout: Float64Array } {
  const t = runSpice(netlist, 'dc Vin -6 6 0.01', ['v(out)']);
  return { vin: t['v-sweep'] as Float64Array, vout: t['v(out)'] as Float64Array };
}

function at(s: { vin: Float64Array; vout: Float64Array }, x: number): number {
  let best = 0;
  for (let i = 0; i < s.vin.length; i++) if (Math.abs((s.vin[i] as number) - x) < Math.abs((s.vin[best] as number) - x)) best = i;
  return s.vout[best] as number;
}

/** Where the straight part of the transfer curve (|vout| between 1 and 3 V) meets vout = 0, by least squares. */
function knee(s: { vin: Float64Array; vout: Float64Array }, side: 1 | -1): number {
  let n = 0,
    sx = 0,
    sy = 0,
    sxx = 0,
    sxy = 0;
  for (let i = 0; i < s.vin.length; i++) {
    const y = (s.vout[i] as number) * side;
    if (y < 1 || y > 3) continue;
    const x = (s.vin[i] as number) * side;
    n++;
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
  }
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
  const intercept = (sy - slope * sx) / n;
  return -intercept / slope;
}

function run(json: Record<string, unknown>, input: Waveform) {
  const p = pushPullKind.parse({ json, path: 'stages[3]' }, 'x.plan.json');
  const parts = Object.fromEntries(Object.entries(p.parts).map(([k, v]) => [k, v.nominal]));
  return pushPullKind.evaluate({ parts, settings: p.settings as PushPullSettings, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {}, input });
}

const sine = (peak: number): Waveform => fromPhase(1000, (p) => peak * Math.sin(2 * Math.PI * p));

describe('push-pull against ngspice DC sweeps (2N3904/2N3906 models from memory)', () => {
  test('no bias: dead band about ±0.6–0.7 V and the peak loses a Vbe', () => {
    const s = sweep(unbiased);
    const upper = knee(s, 1);
    const lower = knee(s, -1);
    // Common practice, no source: a silicon junction drops about 0.6–0.7 V.
    expect(upper).toBeGreaterThan(0.6);
    expect(upper).toBeLessThan(0.75);
    expect(lower).toBeGreaterThan(0.6);
    expect(lower).toBeLessThan(0.75);
    const r = run({ bias: 'none', parts: { Rload: '1k 5%' } }, sine(5));
    // The tool's dead band (its definition: drive width where dvout/dvin < 1/2, default
    // vbe 0.65 V at 1 mA) against the same definition on the ngspice sweep of the
    // 2N3904/2N3906 models (whose Vbe at 1 mA differ from the default by up to 56 mV): within 0.15 V.
    let width = 0;
    for (let i = 1; i < s.vin.length; i++) {
      const slope = ((s.vout[i] as number) - (s.vout[i - 1] as number)) / ((s.vin[i] as number) - (s.vin[i - 1] as number));
      if (Math.abs(s.vin[i] as number) < 2 && slope < 0.5) width += (s.vin[i] as number) - (s.vin[i - 1] as number);
    }
    expect(Math.abs((r.values['deadband'] as number) - width)).toBeLessThan(0.15);
    // Output peak-to-peak at 5 V peak drive, ngspice DC sweep: within 3 %.
    const spiceVpp = at(s, 5) - at(s, -5);
    // ngspice DC sweep of the same follower (this run): 3 %.
    expect(Math.abs((r.values['out.vpp'] as number) - spiceVpp) / spiceVpp).toBeLessThan(0.03);
    // Inside the dead band nothing comes out, in both.
    expect(Math.abs(at(s, 0.3))).toBeLessThan(0.01);
    // Where the drive is 0.61 V (sample 5 of 256) the pair barely conducts, in both: within 20 mV of ngspice.
    const x5 = 5 * Math.sin((2 * Math.PI * 5) / 256);
    expect(Math.abs((r.outputs['out']?.samples[5] as number) - at(s, x5))).toBeLessThan(0.02);
    expect(r.warnings.map((w) => w.message).join()).toMatch(/crossover/);
  });

  test('diode bias: the output follows the input, no dead band', () => {
    const s = sweep(diodeBiased);
    // Slope through zero close to 1 and no step: the diodes cancel Vbe.
    const slope = (at(s, 0.2) - at(s, -0.2)) / 0.4;
    expect(slope).toBeGreaterThan(0.9);
    expect(Math.abs(at(s, 0))).toBeLessThan(0.1);
    const r = run({ bias: 'diodes', parts: { Rload: '1k 5%' } }, sine(5));
    expect(r.values['deadband']).toBe(0);
    const spiceVpp = at(s, 5) - at(s, -5);
    expect(Math.abs((r.values['out.vpp'] as number) - spiceVpp) / spiceVpp).toBeLessThan(0.03);
  });
});

describe('push-pull without bias: the diode law at knots against a solve per sample', () => {
  test.each([
    [600, 3.85],
    [100, 1],
    [1000, 5],
    [10_000, 10],
    [330, 2],
  ])('Rload %d Ω, %d V peak: every sample within 1 mV of a bisection', (rl, peak) => {
    const r = run({ bias: 'none', parts: { Rload: String(rl) }, vbe: '0.65 V' }, sine(peak));
    // Ebers–Moll with IS from Vbe = 0.65 V at 1 mA (kT/q at 27 °C, SI 2019 constants), β = 100 (the default):
    // y + Vt·ln(1 + y/k) = |x|, k = RL·IS·(1 + 1/β), bisected to 1e-12 V.
    const vt = 0.025865;
    const k = rl * (1e-3 / Math.expm1(0.65 / vt)) * 1.01;
    const samples = sine(peak).samples;
    let worst = 0;
    for (let i = 0; i < samples.length; i++) {
      const x = samples[i] as number;
      let lo = 0;
      let hi = Math.abs(x);
      for (let it = 0; it < 200 && hi - lo > 1e-12; it++) {
        const m = (lo + hi) / 2;
        if (m + vt * Math.log1p(m / k) > Math.abs(x)) hi = m;
        else lo = m;
      }
      worst = Math.max(worst, Math.abs(Math.sign(x) * lo - (r.outputs['out']?.samples[i] as number)));
    }
    expect(worst).toBeLessThan(1e-3);
  });
});

describe('push-pull currents and limits', () => {
  test('peak load current and base drive Ipeak/hfe', () => {
    const r = run({ bias: 'diodes', parts: { Rload: '470' }, hfe: 80 }, sine(4.7));
    // Ohm's law: 4.7 V / 470 Ω = 10 mA; base drive 10 mA / 80.
    expect(r.values['out.ipeak']).toBeCloseTo(0.01, 9);
    expect(r.values['base.ipeak']).toBeCloseTo(0.01 / 80, 9);
  });

  test('clips a Vbe inside the rails, and warns of heat into a heavy load', () => {
    const r = run({ bias: 'diodes', parts: { Rload: '8.2' } }, sine(14));
    expect(Math.max(...((r.outputs['out']?.samples ?? []) as Float64Array))).toBeCloseTo(12 - 0.65, 9);
    const text = r.warnings.map((w) => w.message).join(' ');
    expect(text).toMatch(/clips/);
    expect(text).toMatch(/do not touch/);
  });

  test('without a load no current checks are offered', () => {
    const p = pushPullKind.parse({ json: { bias: 'none' }, path: 'stages[3]' }, 'x.plan.json');
    expect(pushPullKind.checks(p.settings).map((c) => c.key)).toEqual(['out.vpp', 'deadband']);
  });

  test.each([
    [{}, /stages\[3\]\.bias: missing; write "none" or "diodes"/],
    [{ bias: 'class-b' }, /stages\[3\]\.bias: "class-b" is not one of/],
    [{ bias: 'none', vbe: '0.7 A' }, /stages\[3\]\.vbe: .*current/],
    [{ bias: 'none', parts: { Rload: '-8' } }, /stages\[3\]\.parts\.Rload: "-8" must be above zero/],
  ])('plan error %j', (json, message) => {
    expect(() => pushPullKind.parse({ json, path: 'stages[3]' }, 'x.plan.json')).toThrow(StageParseError);
    expect(() => pushPullKind.parse({ json, path: 'stages[3]' }, 'x.plan.json')).toThrow(message);
  });

  test('hints carry the hot-transistor caution', () => {
    expect(Object.values(pushPullKind.faultHints).flat().join(' ')).toMatch(/get hot/);
  });
});

describe('diode bias: the dead band is what the bias diode does not cancel', () => {
  test('a diode dropping 50 mV less than Vbe leaves a 0.1 V dead band; one dropping more leaves none', () => {
    const parsed = pushPullKind.parse(
      { json: { id: 'drv', kind: 'push-pull', input: 'a.out', bias: 'diodes', vd: '0.6 V', parts: { Rload: '1k' } }, path: 'stages[3]' },
      'pp.plan.json',
    );
    // The default diode is matched to Vbe with a ±8 % spread (common practice, no source).
    expect(parsed.parts['vd']?.nominal).toBeCloseTo(0.6, 12);
    const parts = Object.fromEntries(Object.entries(parsed.parts).map(([k, p]) => [k, p.nominal]));
    const sine = fromPhase(1000, (ph) => 4 * Math.sin(2 * Math.PI * ph));
    const run = (vd: number) =>
      pushPullKind.evaluate({
        parts: { ...parts, vd },
        settings: parsed.settings,
        opamp: defaultOpamp,
        supplies: { pos: 12, neg: -12 },
        rails: {},
        input: sine,
      });
    // 2·(Vbe − vd) with Vbe = 0.65 V (arithmetic on the stated model).
    expect(run(0.6).values['deadband']).toBeCloseTo(0.1, 9);
    expect(run(0.7).values['deadband']).toBe(0);
    // The output loses what the dead band takes off each peak: 8 − 2·0.05 V.
    expect(run(0.6).values['out.vpp']).toBeCloseTo(7.9, 6);
  });

  test('the default bias diode gives a dead band target of 0 … about 0.1 V', () => {
    const parsed = pushPullKind.parse({ json: { id: 'drv', kind: 'push-pull', input: 'a.out', bias: 'diodes' }, path: 'stages[3]' }, 'pp.plan.json');
    const vd = parsed.parts['vd'];
    // The default bias diode drop, a silicon diode's 0.6–0.7 V (common practice, no source).
    expect(vd?.nominal).toBeCloseTo(0.65, 12);
    expect(vd?.tol).toBeCloseTo(0.08, 12);
  });

  test('vd without diode bias is a plan error naming the path', () => {
    expect(() =>
      pushPullKind.parse({ json: { id: 'drv', kind: 'push-pull', input: 'a.out', bias: 'none', vd: '0.6 V' }, path: 'stages[3]' }, 'pp.plan.json'),
    ).toThrow(/stages\[3\]\.vd: a bias diode drop only applies/);
  });
});
