import FFT from 'fft.js';
import { describe, expect, test } from 'vitest';
import { diodeShaperKind, type DiodeShaperSettings } from '../../src/circuit/diode-shaper.js';
import { diodeString } from '../../src/circuit/diode.js';
import { nodeCurrent } from '../../src/circuit/shaper-solver.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import type { Waveform } from '../../src/circuit/types.js';
import { fromPhase, thd } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';
import { runSpice } from '../helpers/ngspice.js';

/**
 * Shaper networks with invented values (not taken from any published board).
 * `drive` is the design triangle peak each was laid out for.
 */
interface Net {
  readonly name: string;
  readonly json: Record<string, unknown>;
  readonly drive: number;
}

const netTwoPairs: Net = {
  name: 'two breakpoint pairs, biased branches',
  drive: 2.2,
  json: {
    parts: { Rs: '5k6 1%', Rload: '27k 1%' },
    branches: [
      { diodes: 1, polarity: '+', R: '3k9 1%', bias: '0.3 V' },
      { diodes: 1, polarity: '-', R: '3k9 1%', bias: '-0.3 V' },
      { diodes: 1, polarity: '+', R: '820 1%', bias: '0.9 V' },
      { diodes: 1, polarity: '-', R: '820 1%', bias: '-0.9 V' },
    ],
  },
};

const netThreePairs: Net = {
  name: 'three breakpoint pairs, series diodes, asymmetric',
  drive: 2,
  json: {
    parts: { Rs: '8k2 1%' },
    branches: [
      { diodes: 2, polarity: '+', R: '6k8 1%', bias: '0 V' },
      { diodes: 2, polarity: '-', R: '6k8 1%', bias: '0 V' },
      { diodes: 1, polarity: '+', R: '2k7 1%', bias: '0.8 V' },
      { diodes: 1, polarity: '-', R: '2k4 1%', bias: '-0.75 V' },
      { diodes: 1, polarity: '+', R: '560 1%', bias: '1.6 V' },
      { diodes: 1, polarity: '-', R: '560 1%', bias: '-1.6 V' },
    ],
  },
};

function parsed(net: Net): { parts: Record<string, number>; settings: DiodeShaperSettings } {
  const p = diodeShaperKind.parse({ json: net.json, path: 'stages[1]' }, 'test.plan.json');
  return { parts: Object.fromEntries(Object.entries(p.parts).map(([k, v]) => [k, v.nominal])), settings: p.settings };
}

function evaluate(net: Net, input: Waveform) {
  const { parts, settings } = parsed(net);
  return diodeShaperKind.evaluate({ parts, settings, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {}, input });
}

/** The same network as an ngspice deck, with the same diode model (SPICE D: IS, N, RS). */
function spiceNet(net: Net): string {
  const { parts, settings } = parsed(net);
  const d = settings.diode;
  const lines = [`Rs in out ${parts['Rs']}`];
  if (settings.hasLoad) lines.push(`Rload out 0 ${parts['Rload']}`);
  settings.branches.forEach((b, i) => {
    // A chain of diodes from the node to the resistor: anode at the node for `+`.
    const nodes = [`out`, ...Array.from({ length: b.diodes }, (_, j) => `b${i}d${j}`)];
    for (let j = 0; j < b.diodes; j++) {
      const [a, c] = b.polarity === '+' ? [nodes[j], nodes[j + 1]] : [nodes[j + 1], nodes[j]];
      lines.push(`D${i}x${j} ${a} ${c} dshape`);
    }
    lines.push(`R${i} ${nodes[b.diodes]} b${i}v ${parts[b.rRole]}`);
    lines.push(`V${i} b${i}v 0 DC ${parts[b.biasRole]}`);
  });
  lines.push(`.model dshape D (IS=${d.is} N=${d.n} RS=${d.rs})`);
  return lines.join('\n');
}

/** An ideal triangle of this peak, rising through zero at phase 0. */
function triangle(peak: number, frequency = 1000, n = 256): Waveform {
  return fromPhase(frequency, (p) => peak * (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4), n);
}

/** Amplitudes of harmonics 1…top of a uniformly sampled whole period (direct DFT). */
function dftAmplitudes(samples: Float64Array, top: number): number[] {
  const n = samples.length;
  const out: number[] = [];
  for (let k = 1; k <= top; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      re += (samples[i] ?? 0) * Math.cos(a);
      im += (samples[i] ?? 0) * Math.sin(a);
    }
    out.push((2 * Math.hypot(re, im)) / n);
  }
  return out;
}

function thdOf(amplitudes: number[]): number {
  const [f1 = 0, ...rest] = amplitudes;
  return Math.sqrt(rest.reduce((s, a) => s + a * a, 0)) / f1;
}

/** Resample an ngspice transient (non-uniform time steps) to n uniform points over [0, period). */
function resample(time: Float64Array, v: Float64Array, period: number, n: number): Float64Array {
  const out = new Float64Array(n);
  let j = 0;
  for (let i = 0; i < n; i++) {
    const t = (i * period) / n;
    while (j < time.length - 2 && (time[j + 1] ?? 0) < t) j++;
    const t0 = time[j] ?? 0;
    const t1 = time[j + 1] ?? 0;
    const w = t1 > t0 ? (t - t0) / (t1 - t0) : 0;
    out[i] = (v[j] ?? 0) * (1 - w) + (v[j + 1] ?? 0) * w;
  }
  return out;
}

/** ngspice transient of a triangle drive (PWL through one period; the network has no storage). */
function spiceTriangleThd(net: Net, peak: number): { thd: number; resampled: Float64Array } {
  const period = 1e-3;
  const deck = `${spiceNet(net)}\nVin in 0 PWL(0 0 ${period / 4} ${peak} ${(3 * period) / 4} ${-peak} ${period} 0)`;
  const t = runSpice(deck, `tran ${period / 8192} ${period} 0 ${period / 8192}`, ['v(out)']);
  const resampled = resample(t['time'] as Float64Array, t['v(out)'] as Float64Array, period, 4096);
  return { thd: thdOf(dftAmplitudes(resampled, 50)), resampled };
}

describe('diode-shaper against ngspice (same SPICE diode model)', () => {
  for (const net of [netTwoPairs, netThreePairs]) {
    test(`DC transfer curve: ${net.name}`, () => {
      const step = 0.02;
      const table = runSpice(`${spiceNet(net)}\nVin in 0 DC 0`, `dc Vin -6 6 ${step}`, ['v(out)']);
      const sweep = table['v-sweep'] as Float64Array;
      const spice = table['v(out)'] as Float64Array;
      const ours = evaluate(net, { frequency: 0, samples: Float64Array.from(sweep) }).outputs['out']?.samples as Float64Array;
      let worst = 0;
      for (let i = 0; i < sweep.length; i++) {
        const ref = spice[i] as number;
        const err = Math.abs((ours[i] as number) - ref);
        // ngspice DC sweep: within 2 % or 20 mV, whichever is larger.
        expect(err).toBeLessThanOrEqual(Math.max(0.02 * Math.abs(ref), 0.02));
        worst = Math.max(worst, err);
      }
      // In fact the two solve the same equations: far closer than the allowance.
      // ngspice DC sweep of the same network (this run): 1 mV.
      expect(worst).toBeLessThan(1e-3);
    });

    for (const scale of [0.8, 1, 1.2]) {
      test(`THD of a triangle at ${Math.round(scale * 100)} % of the design drive: ${net.name}`, () => {
        const peak = net.drive * scale;
        const ref = spiceTriangleThd(net, peak).thd;
        const ours = evaluate(net, triangle(peak)).values['out.thd'] as number;
        // ngspice transient, harmonics 2–50 by DFT of 4096 uniform resamples: within 1 percentage point…
        expect(Math.abs(ours - ref)).toBeLessThan(0.01);
        // …and within 25 % of the reference where it is above 1 %.
        if (ref > 0.01) expect(Math.abs(ours - ref) / ref).toBeLessThan(0.25);
        // Near its design drive the network really shapes: well below the triangle's 12.1 %.
        expect(ours).toBeLessThan(0.06);
      });
    }
  }

  test('the test DFT agrees with fft.js on one simulated waveform', () => {
    const { resampled } = spiceTriangleThd(netTwoPairs, netTwoPairs.drive);
    const direct = dftAmplitudes(resampled, 50);
    const f = new FFT(resampled.length);
    const out = f.createComplexArray();
    f.realTransform(out, resampled);
    for (let k = 1; k <= 50; k++) {
      const viaFft = (2 * Math.hypot(out[2 * k] ?? 0, out[2 * k + 1] ?? 0)) / resampled.length;
      // fft.js (independent radix-4 FFT): same amplitudes to 1e-9 V.
      expect(Math.abs(viaFft - (direct[k - 1] ?? 0))).toBeLessThan(1e-9);
    }
  });
});

describe('diode-shaper behaviour', () => {
  test('a drive too small to reach any breakpoint leaves the triangle THD, √(π⁴/96 − 1) ≈ 12.1 %', () => {
    const r = evaluate(netTwoPairs, triangle(0.05));
    // Fourier series of the ideal triangle (odd harmonics 1/k², handbook result), harmonics 2–50:
    // the 256-sample record aliases harmonics above 128 onto the band, hence 0.1 pp.
    const ideal = Math.sqrt(Math.PI ** 4 / 96 - 1);
    expect(r.values['out.thd']).toBeCloseTo(ideal, 3);
    expect(r.warnings.map((w) => w.message).join()).toMatch(/never reaches a breakpoint/);
  });

  test('FFT THD equals the direct-DFT definition in waveform.ts', () => {
    const r = evaluate(netThreePairs, triangle(4.5));
    const out = r.outputs['out'] as Waveform;
    // DESIGN §4 THD definition (RSS of harmonics 2…50 over the fundamental) as waveform.ts computes it on the same output: identical up to rounding.
    expect(Math.abs((r.values['out.thd'] as number) - thd(out))).toBeLessThan(1e-12);
  });

  test('the mirrored walk (half the samples solved) equals solving every sample', () => {
    const tri = triangle(2);
    const broken = Float64Array.from(tri.samples);
    // 1 nV on one sample far from the peak breaks the mirror: every sample is then solved.
    broken[40] = (broken[40] as number) + 1e-9;
    const a = evaluate(netThreePairs, tri).outputs['out']?.samples as Float64Array;
    const b = evaluate(netThreePairs, { frequency: 1000, samples: broken }).outputs['out']?.samples as Float64Array;
    // Both are Newton solutions good to about 1 µV (see shaper-solver.ts).
    for (let i = 0; i < a.length; i++) expect(Math.abs((a[i] as number) - (b[i] as number))).toBeLessThan(2e-6);
  });

  test('the Newton walk agrees with a bisection on the node current to 2 µV, from a trickle to a 10 V overdrive', () => {
    const { parts, settings } = parsed(netThreePairs);
    for (const peak of [0.3, 2, 10]) {
      const r = evaluate(netThreePairs, triangle(peak)).outputs['out']?.samples as Float64Array;
      const net = {
        gs: 1 / (parts['Rs'] as number),
        gl: 0,
        branches: settings.branches.map((b) => ({
          sign: b.polarity === '+' ? (1 as const) : (-1 as const),
          bias: parts[b.biasRole] as number,
          diodes: diodeString(settings.diode, b.diodes, parts[b.rRole] as number),
        })),
      };
      const tri = triangle(peak).samples;
      for (let i = 0; i < tri.length; i += 7) {
        // Bisection on Kirchhoff's current law at the node: slow, sure, independent of the Newton path.
        let lo = -20;
        let hi = 20;
        for (let it = 0; it < 100; it++) {
          const mid = (lo + hi) / 2;
          if (nodeCurrent(net, tri[i] as number, mid) > 0) lo = mid;
          else hi = mid;
        }
        // The independent bisection above (Shockley law, 100 halvings: exact to rounding); 2 µV allowed for the solver.
        expect(Math.abs((r[i] as number) - (lo + hi) / 2)).toBeLessThan(2e-6);
      }
    }
  });

  test('a square drive (jumps) and a heavy ±40 V overdrive solve without NaN and stay between the limits', () => {
    const square = fromPhase(1000, (p) => (p < 0.5 ? 40 : -40));
    const json = structuredClone(netTwoPairs.json) as { parts: Record<string, string>; branches: { R: string }[] };
    json.parts['Rs'] = '47';
    (json.branches[2] as { R: string }).R = '47';
    const r = evaluate({ ...netTwoPairs, json }, square);
    const out = r.outputs['out']?.samples as Float64Array;
    for (const v of out) {
      expect(Number.isFinite(v)).toBe(true);
      // Bounded by the input's peak: the shaper is passive (common practice, no source).
      expect(Math.abs(v)).toBeLessThan(40);
    }
    expect(r.warnings.map((w) => w.message).join()).toMatch(/mA at the peak/);
  });

  test('a diode fitted backwards (branch polarity swapped) raises THD: the hint it names', () => {
    const good = evaluate(netTwoPairs, triangle(3)).values['out.thd'] as number;
    const json = structuredClone(netTwoPairs.json) as { branches: { polarity: string }[] };
    (json.branches[2] as { polarity: string }).polarity = '-';
    const bad = evaluate({ ...netTwoPairs, json }, triangle(3)).values['out.thd'] as number;
    // A diode fitted backwards breaks the shaping: THD more than doubles (two runs of the same model, no outside figure).
    expect(bad).toBeGreaterThan(2 * good);
    expect(diodeShaperKind.faultHints['out.thd']?.join(' ')).toMatch(/backwards/);
  });
});

describe('diode-shaper plan errors name the path', () => {
  const bad = (json: Record<string, unknown>): string => {
    try {
      diodeShaperKind.parse({ json, path: 'stages[1]' }, 'x.plan.json');
    } catch (e) {
      expect(e).toBeInstanceOf(StageParseError);
      return (e as Error).message;
    }
    throw new Error('no error');
  };
  test.each([
    [{ parts: { Rs: '4k7 x' }, branches: [] }, /stages\[1\]\.parts\.Rs: .*write e\.g\. "4k7 1%"/],
    [{ parts: { Rs: '4k7' } }, /stages\[1\]\.branches: missing/],
    [{ parts: { Rs: '4k7' }, branches: [{ polarity: '+', R: '1k', diodes: 0 }] }, /stages\[1\]\.branches\[0\]\.diodes/],
    [{ parts: { Rs: '4k7' }, branches: [{ polarity: 'up', R: '1k' }] }, /stages\[1\]\.branches\[0\]\.polarity: "up" is not one of "\+" or "-"/],
    [{ parts: { Rs: '4k7' }, branches: [{ polarity: '+', R: '1k', bias: '2 A' }] }, /stages\[1\]\.branches\[0\]\.bias: .*current.*voltage/],
    [{ parts: { Rs: '4k7', Rx: '1k' }, branches: [{ polarity: '+', R: '1k' }] }, /stages\[1\]\.parts\.Rx: is not a key here/],
    [{ parts: { Rs: '4k7' }, branches: [{ polarity: '+', R: '1k' }], diode: '1N9999' }, /stages\[1\]\.diode: no diode model "1N9999"/],
    [{ parts: { Rs: '4k7' }, branches: [{ polarity: '+', R: '1k' }], diode: { is: '2n', n: 0 } }, /stages\[1\]\.diode\.n: .*above zero/],
  ])('%j', (json, message) => {
    expect(bad(json)).toMatch(message);
  });

  test('toleranced branch values become dotted part roles', () => {
    const p = diodeShaperKind.parse({ json: netTwoPairs.json, path: 'stages[1]' }, 'x.plan.json');
    expect(Object.keys(p.parts)).toEqual(expect.arrayContaining(['Rs', 'Rload', 'branches[0].R', 'branches[0].bias', 'branches[3].bias']));
    expect(p.parts['branches[2].R']).toMatchObject({ nominal: 820, tol: 0.01, unit: 'Ω' });
  });
});

describe('the Monte Carlo fast path (isTrial) against the full per-sample solve', () => {
  // The fast path interpolates the transfer curve between solved knots (cubic
  // Hermite with the exact slope); it must agree with the full Newton solve,
  // which is itself checked against ngspice above. Tolerances: 1 mV on the
  // waveform, 5e-4 absolute on THD (a twentieth of the 1-point ngspice limit).
  for (const net of [netTwoPairs, netThreePairs]) {
    for (const scale of [0.8, 1, 1.2]) {
      test(`${net.name} at ${scale * 100} % drive, and on a skewed triangle`, () => {
        const { parts, settings } = parsed(net);
        const peak = net.drive * scale;
        const inputs: Waveform[] = [
          triangle(peak),
          // Unequal slopes (a trial with unequal rails): rising over 40 % of the period.
          fromPhase(1000, (p) => (p < 0.4 ? -peak + (2 * peak * p) / 0.4 : peak - (2 * peak * (p - 0.4)) / 0.6)),
        ];
        for (const input of inputs) {
          const base = { parts, settings, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {}, input };
          const full = diodeShaperKind.evaluate(base);
          const fast = diodeShaperKind.evaluate({ ...base, isTrial: true });
          const a = full.outputs['out']?.samples as Float64Array;
          const b = fast.outputs['out']?.samples as Float64Array;
          let worst = 0;
          for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs((a[i] ?? 0) - (b[i] ?? 0)));
          // The trial path against the full solve of the same model: the bench accuracy a trial may
          // trade for speed (EvalInput.isTrial, tens of µV) with room, 1 mV; THD to 0.05 %.
          expect(worst).toBeLessThan(1e-3);
          expect(Math.abs((fast.values['out.thd'] ?? 0) - (full.values['out.thd'] ?? 0))).toBeLessThan(5e-4);
          expect(Math.abs((fast.values['out.vpp'] ?? 0) - (full.values['out.vpp'] ?? 0))).toBeLessThan(1e-3);
        }
      });
    }
  }
});
