import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target } from '../../src/analysis/types.js';
import { loadPlanFile } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { corner, runSpice, type SpiceTable } from '../helpers/ngspice.js';
import { node, planDeck } from '../helpers/plan-deck.js';

/*
 * Both demo boards (invented values) as full-chain ngspice decks generated from
 * their plans (test/helpers/plan-deck.ts states every model), against the
 * targets computed with every stage loaded by the next:
 * - transient of the whole chain, measured over the last three whole periods
 *   after the start-up: peak-to-peak of every node, frequency and duty from
 *   interpolated mid-level crossings of the square (IEEE 181 50 % reference
 *   level), THD from a DFT of the shaper node resampled over those periods
 *   (harmonics 2–50, DESIGN §4);
 * - small-signal figures as the bench takes them, on a deck from that stage on
 *   (its input driven by a source, everything downstream connected): a corner or
 *   a bandwidth from an AC sweep (−3 dB), a gain from the real part at 10 Hz;
 * - the follower's dead band (drive width where dvout/dvin < 1/2), standing
 *   current and offset from a DC sweep and an operating point of its own deck.
 * Limits (issue 11): 2 % of the ngspice value; 5 % for follower amplitudes and
 * dead bands; 1 percentage point for THD; values near zero (an offset, a dead
 * band of 0) within 5 mV. And the ngspice value must lie inside the worst-case band.
 */

interface Crossings {
  readonly up: number[];
  readonly down: number[];
}

function crossings(t: Float64Array, v: Float64Array, level: number, from: number): Crossings {
  const up: number[] = [];
  const down: number[] = [];
  for (let i = 1; i < t.length; i++) {
    const t0 = t[i - 1] as number;
    if (t0 < from) continue;
    const a = (v[i - 1] as number) - level;
    const b = (v[i] as number) - level;
    const at = t0 + ((t[i] as number) - t0) * (a / (a - b));
    if (a < 0 && b >= 0) up.push(at);
    if (a > 0 && b <= 0) down.push(at);
  }
  return { up, down };
}

/** Values of v over [t0, t1), resampled at n uniform points (linear interpolation). */
function resample(t: Float64Array, v: Float64Array, t0: number, t1: number, n: number): Float64Array {
  const out = new Float64Array(n);
  let j = 0;
  for (let i = 0; i < n; i++) {
    const at = t0 + ((t1 - t0) * i) / n;
    while (j < t.length - 2 && (t[j + 1] as number) < at) j++;
    const a = t[j] as number;
    const b = t[j + 1] as number;
    const w = b > a ? (at - a) / (b - a) : 0;
    out[i] = (v[j] as number) * (1 - w) + (v[j + 1] as number) * w;
  }
  return out;
}

/** THD of `periods` whole periods of samples: RSS of harmonics 2–50 over the fundamental (direct DFT at bins k·periods). */
function thdOf(x: Float64Array, periods: number): number {
  const n = x.length;
  const amp = (k: number): number => {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * periods * i) / n;
      re += (x[i] as number) * Math.cos(a);
      im += (x[i] as number) * Math.sin(a);
    }
    return Math.hypot(re, im);
  };
  const f1 = amp(1);
  let sum = 0;
  for (let k = 2; k <= 50; k++) sum += amp(k) ** 2;
  return Math.sqrt(sum) / f1;
}

function extremesIn(t: Float64Array, v: Float64Array, t0: number, t1: number): { hi: number; lo: number } {
  let hi = -Infinity;
  let lo = Infinity;
  for (let i = 0; i < t.length; i++) {
    const x = t[i] as number;
    if (x < t0 || x > t1) continue;
    hi = Math.max(hi, v[i] as number);
    lo = Math.min(lo, v[i] as number);
  }
  return { hi, lo };
}

/** The measured figures of a board, by check id. */
type Figures = Record<string, number>;

/** Transient of the whole board; returns the table and the window of three whole periods to measure over. */
function transient(plan: Plan, period: number, periods: number, step: number, vectors: string[], pot?: number): SpiceTable {
  const deck = planDeck(plan, pot === undefined ? {} : { pot });
  return runSpice(deck, `tran ${step.toExponential(4)} ${(periods * period).toExponential(4)} 0 ${step.toExponential(4)} uic`, vectors);
}

/** −3 dB corner and 10 Hz gain of `output` with `stage`'s input driven (AC 1), its downstream connected. */
function acFrom(plan: Plan, stage: string, output: string): { fc: number; gain: number } {
  const deck = planDeck(plan, { from: stage, drive: 'DC 0 AC 1' });
  const t = runSpice(deck, 'ac dec 200 10 100meg', [`vm(${output})`, `vr(${output})`]);
  const f = t['frequency'] as Float64Array;
  return { fc: corner(f, t[`vm(${output})`] as Float64Array), gain: (t[`vr(${output})`] as Float64Array)[0] as number };
}

/** The follower's dead band, offset and standing current on its own deck. */
function followerFigures(plan: Plan, id: string): Figures {
  const out = node(id, 'out');
  const sweep = runSpice(planDeck(plan, { from: id, drive: 'DC 0' }), 'dc Vdrive -3 3 0.002', [`v(${out})`]);
  const x = sweep['v-sweep'] as Float64Array;
  const y = sweep[`v(${out})`] as Float64Array;
  let width = 0;
  for (let i = 1; i < x.length; i++) {
    const slope = ((y[i] as number) - (y[i - 1] as number)) / ((x[i] as number) - (x[i - 1] as number));
    if (slope < 0.5) width += (x[i] as number) - (x[i - 1] as number);
  }
  const opNames = [`v(${out})`, `i(V${id}scn)`, `i(V${id}scp)`];
  const op = runSpice(planDeck(plan, { from: id, drive: 'DC 0' }), 'op', opNames);
  return {
    [`${id}.deadband`]: width,
    [`${id}.out.dc`]: op[opNames[0] as string]?.[0] ?? Number.NaN,
    [`${id}.iq`]: 0.5 * ((op[opNames[1] as string]?.[0] ?? Number.NaN) + (op[opNames[2] as string]?.[0] ?? Number.NaN)),
  };
}

/** How close the model must come, by check (issue 11). */
function within(check: string, kind: string, model: number, spice: number): boolean {
  if (check.endsWith('.thd')) return Math.abs(model - spice) < 0.01;
  const follower = kind === 'push-pull';
  if (check.endsWith('.out.dc') || check.endsWith('.deadband')) {
    if (Math.abs(spice) < 5e-3) return Math.abs(model - spice) < 5e-3;
  }
  const rel = follower && (check.endsWith('.vpp') || check.endsWith('.deadband') || check.endsWith('.ipeak')) ? 0.05 : 0.02;
  return Math.abs(model / spice - 1) < rel;
}

function compare(plan: Plan, targets: readonly Target[], spice: Figures): string[] {
  const problems: string[] = [];
  const rows: string[] = [];
  for (const [check, value] of Object.entries(spice)) {
    const t = targets.find((x) => x.check === check);
    if (!t) {
      problems.push(`${check}: no target`);
      continue;
    }
    const kind = plan.stages.find((s) => s.id === t.stage)?.kind ?? '';
    const ok = within(check, kind, t.nominal, value);
    // The ngspice value inside the worst-case band (a hair of numerical slack for a band that is a point).
    const slack = 1e-9 + 1e-6 * Math.abs(value);
    const inside = value >= t.worst.min - slack && value <= t.worst.max + slack;
    rows.push(
      `${check.padEnd(20)} model ${t.nominal.toPrecision(5).padStart(11)}  ngspice ${value.toPrecision(5).padStart(11)}  band ${t.worst.min.toPrecision(4)} … ${t.worst.max.toPrecision(4)}${ok ? '' : '  OFF'}${inside ? '' : '  OUTSIDE'}`,
    );
    if (!ok) problems.push(`${check}: model ${t.nominal} against ngspice ${value}`);
    if (!inside) problems.push(`${check}: ngspice ${value} outside the worst-case band ${t.worst.min} … ${t.worst.max}`);
  }
  console.log(`${plan.plan}\n${rows.join('\n')}`);
  return problems;
}

describe('demo boards as full-chain ngspice decks, nominal parts', () => {
  test('line driver: every modelled check within its limit of ngspice and inside its band', async () => {
    const plan = await loadPlanFile('demo/line-driver.plan.json');
    const targets = computeTargets(plan, { trials: 1000 }).targets;
    const period = 1e-3;
    const nodes = ['in', 'filt', 'amp', 'out'].map((s) => node(s, 'out'));
    const tab = transient(plan, period, 8, period / 4000, [...nodes.map((n) => `v(${n})`), 'i(Voutsbn)', 'i(Voutsbp)']);
    const t = tab['time'] as Float64Array;
    const t1 = 8 * period;
    const t0 = t1 - 3 * period;
    const spice: Figures = {};
    for (const s of ['in', 'filt', 'amp', 'out']) {
      const e = extremesIn(t, tab[`v(${node(s, 'out')})`] as Float64Array, t0, t1);
      spice[`${s}.out.vpp`] = e.hi - e.lo;
      if (s === 'out') spice['out.out.ipeak'] = Math.max(e.hi, -e.lo) / 600;
    }
    const ib = Math.max(
      extremesIn(t, tab['i(voutsbn)'] ?? (tab['i(Voutsbn)'] as Float64Array), t0, t1).hi,
      extremesIn(t, tab['i(voutsbp)'] ?? (tab['i(Voutsbp)'] as Float64Array), t0, t1).hi,
    );
    spice['out.base.ipeak'] = ib;
    const filt = acFrom(plan, 'filt', node('filt', 'out'));
    spice['filt.fc'] = filt.fc;
    const amp = acFrom(plan, 'amp', node('amp', 'out'));
    spice['amp.bw'] = amp.fc;
    spice['amp.gain'] = amp.gain;
    const ref = runSpice(planDeck(plan), 'op', [`v(${node('ref', 'out')})`]);
    spice['ref.out.dc'] = ref[`v(${node('ref', 'out')})`]?.[0] ?? Number.NaN;
    const dead = runSpice(planDeck(plan, { from: 'out', drive: 'DC 0' }), 'dc Vdrive -3 3 0.002', [`v(${node('out', 'out')})`]);
    const x = dead['v-sweep'] as Float64Array;
    const y = dead[`v(${node('out', 'out')})`] as Float64Array;
    let width = 0;
    for (let i = 1; i < x.length; i++)
      if (((y[i] as number) - (y[i - 1] as number)) / ((x[i] as number) - (x[i - 1] as number)) < 0.5) width += (x[i] as number) - (x[i - 1] as number);
    spice['out.deadband'] = width;
    expect(compare(plan, targets, spice)).toEqual([]);
  });

  test('exciter: every modelled check within its limit of ngspice and inside its band', async () => {
    const plan = await loadPlanFile('demo/exciter.plan.json');
    const targets = computeTargets(plan, { trials: 1000 }).targets;
    const nominalFreq = targets.find((x) => x.check === 'osc.freq')?.nominal ?? Number.NaN;
    const spice: Figures = {};
    // Oscillator at the plan's setting and at both pot ends (the pot moves only osc's frequency).
    const osc = (pot: number | undefined, freq: number, withChain: boolean): { tab: SpiceTable; t0: number; t1: number; cross: Crossings } => {
      const period = 1 / freq;
      const vectors = withChain
        ? ['osc_square', 'osc_triangle']
            .map((n) => `v(${node('osc', n.slice(4))})`)
            .concat(
              ['shaper', 'gain', 'filt', 'drive'].map((s) => `v(${node(s, 'out')})`),
              ['i(Vdrivesbn)', 'i(Vdrivesbp)'],
            )
        : [`v(${node('osc', 'square')})`, `v(${node('osc', 'triangle')})`];
      // Steps short against the comparator's edges (about 2.6 µs at 8 V/µs).
      const tab = transient(plan, period, 9, Math.min(period / 5000, 1e-7), vectors, pot);
      const t = tab['time'] as Float64Array;
      const sq = tab[`v(${node('osc', 'square')})`] as Float64Array;
      const cross = crossings(t, sq, 0, 3 * period);
      const up = cross.up;
      const t1 = up[up.length - 1] as number;
      const t0 = up[up.length - 4] as number;
      return { tab, t0, t1, cross };
    };
    const main = osc(undefined, nominalFreq, true);
    const t = main.tab['time'] as Float64Array;
    const { t0, t1 } = main;
    spice['osc.freq'] = 3 / (t1 - t0);
    const fall = main.cross.down.find((x) => x > t0) as number;
    spice['osc.duty'] = (fall - t0) / ((t1 - t0) / 3);
    const sq = extremesIn(t, main.tab[`v(${node('osc', 'square')})`] as Float64Array, t0, t1);
    spice['osc.square.vpp'] = sq.hi - sq.lo;
    spice['osc.square.high'] = sq.hi;
    spice['osc.square.low'] = sq.lo;
    const tri = extremesIn(t, main.tab[`v(${node('osc', 'triangle')})`] as Float64Array, t0, t1);
    spice['osc.triangle.vpp'] = tri.hi - tri.lo;
    for (const s of ['shaper', 'gain', 'filt', 'drive']) {
      const e = extremesIn(t, main.tab[`v(${node(s, 'out')})`] as Float64Array, t0, t1);
      spice[`${s}.out.vpp`] = e.hi - e.lo;
      if (s === 'shaper') spice['shaper.out.peak'] = e.hi;
      if (s === 'drive') spice['drive.out.ipeak'] = Math.max(e.hi, -e.lo) / 330;
    }
    spice['shaper.out.thd'] = thdOf(resample(t, main.tab[`v(${node('shaper', 'out')})`] as Float64Array, t0, t1, 3 * 1024), 3);
    spice['drive.base.ipeak'] = Math.max(
      extremesIn(t, main.tab['i(vdrivesbn)'] ?? (main.tab['i(Vdrivesbn)'] as Float64Array), t0, t1).hi,
      extremesIn(t, main.tab['i(vdrivesbp)'] ?? (main.tab['i(Vdrivesbp)'] as Float64Array), t0, t1).hi,
    );
    for (const [check, pot] of [
      ['osc.freq.min', 1],
      ['osc.freq.max', 0],
    ] as const) {
      const f = targets.find((x) => x.check === check)?.nominal ?? Number.NaN;
      const r = osc(pot, f, false);
      spice[check] = 3 / (r.t1 - r.t0);
    }
    const gain = acFrom(plan, 'gain', node('gain', 'out'));
    spice['gain.gain'] = gain.gain;
    spice['gain.bw'] = gain.fc;
    spice['filt.fc'] = acFrom(plan, 'filt', node('filt', 'out')).fc;
    Object.assign(spice, followerFigures(plan, 'drive'));
    expect(compare(plan, targets, spice)).toEqual([]);
  });
});
