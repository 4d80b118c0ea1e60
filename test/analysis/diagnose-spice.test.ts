import { beforeAll, describe, expect, test } from 'vitest';
import { type Diagnosis, diagnose } from '../../src/analysis/diagnose.js';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target } from '../../src/analysis/types.js';
import { uncertaintyFor, verdictFor } from '../../src/analysis/verdict.js';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanText } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { uncertaintyOf } from '../../src/units/uncertainty.js';
import { uncertaintyKey } from '../../src/units/unit.js';
import { display, readWave, type WaveReading } from '../helpers/bench-reader.js';
import { runSpice } from '../helpers/ngspice.js';
import { boardDeck } from '../helpers/spice-board.js';
import { type FaultCase, faultCases, faultSetPlans, healthyCases } from './fixtures/fault-set.js';

/*
 * The diagnosis against boards simulated in ngspice (Debian package, an independent
 * simulator): each board of the fault set is written as a netlist with its fault
 * planted physically (test/helpers/spice-board.ts), simulated, and read as a
 * technician reads a board (test/helpers/bench-reader.ts), every reading with a
 * 0.1 % scatter and rounded to four digits as a display shows it. The diagnosis
 * sees only the plan, its targets and those readings. Goals (issue 12): the planted
 * part in the top 3 for at least 90 % of the faulted boards and first for at least
 * 70 %; no listed hypothesis contradicts a reading; no hypothesis on a healthy board.
 */

/** A seeded standard normal (mulberry32 and Box–Muller), so the set is the same every run. */
function gaussian(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

const plans: Record<string, Plan> = {};
const targets: Record<string, readonly Target[]> = {};

interface Outcome {
  readonly c: FaultCase;
  readonly readings: { check: string; value: number; verdict: 'pass' | 'marginal' | 'fail' }[];
  readonly d: Diagnosis;
  /** 1-based rank of the planted part (as the head of a group or in its alternatives), 0 when missing. */
  readonly rank: number;
}

/** How long to simulate: ten periods of the board's slowest signal, from the plan (the generator, or the oscillator's nominal period, or the faulted one when longer). */
function timing(plan: Plan, c: FaultCase): { period: number; dc: boolean } {
  const gen = plan.stages.find((s) => s.kind === 'signal-in');
  if (gen) return { period: 1 / (gen.parts['frequency']?.nominal ?? 1000), dc: false };
  if (!plan.stages.some((s) => s.kind === 'schmitt-integrator')) return { period: 1e-4, dc: true };
  const chain = buildChain(plan);
  const nominal = 1 / (chain.detail(chain.nominal).values['osc.freq'] ?? 1000);
  const x = Float64Array.from(chain.nominal);
  for (const [name, v] of Object.entries(c.fault.values ?? {})) x[chain.variables.findIndex((w) => w.name === name)] = v;
  const f = chain.detail(
    x,
    undefined,
    c.fault.mode && c.fault.stage && c.fault.role ? { stage: c.fault.stage, role: c.fault.role, mode: c.fault.mode, variant: c.fault.variant ?? 0 } : undefined,
  ).values['osc.freq'];
  const faulted = f !== undefined && f > 0 ? 1 / f : nominal;
  return { period: Math.min(20 * nominal, Math.max(nominal, faulted)), dc: false };
}

function simulate(c: FaultCase, seed: number): Outcome['readings'] {
  const plan = plans[c.plan] as Plan;
  const deck = boardDeck(plan, c.fault);
  const { period, dc } = timing(plan, c);
  const names = Object.values(deck.nodes);
  // Twelve periods, read over the last six: a lopsided oscillator (one side unclamped) takes a few to settle.
  const stop = dc ? period : 12 * period;
  const step = dc ? period / 100 : period / 1500;
  const tab = runSpice(
    deck.netlist,
    `tran ${step.toExponential(4)} ${stop.toExponential(4)} 0 ${step.toExponential(4)} uic`,
    names.map((n) => `v(${n})`),
  );
  const t = tab['time'] ?? new Float64Array();
  const waves = new Map<string, WaveReading>();
  const wave = (output: string): WaveReading => {
    let w = waves.get(output);
    if (!w) {
      w = readWave(t, tab[`v(${deck.nodes[output]})`] ?? new Float64Array(), dc ? period / 2 : 6 * period);
      waves.set(output, w);
    }
    return w;
  };
  const noise = gaussian(seed);
  const readings: Outcome['readings'] = [];
  for (const target of targets[c.plan] as readonly Target[]) {
    if (target.phase === 'unpowered' || target.phase === 'first-power') continue;
    const value = readingOf(plan, deck.rails, target, wave);
    if (value === undefined || !Number.isFinite(value)) continue;
    const read = display(value * (1 + 0.001 * noise()));
    readings.push({
      check: target.check,
      value: read,
      verdict: verdictFor(target, read, uncertaintyFor(plan, target.check, uncertaintyKey(target.unit))).verdict,
    });
  }
  return readings;
}

/** What a technician reads for a check, or undefined for checks the set does not read (pot ends, bandwidths, corners, dead band, currents). */
function readingOf(plan: Plan, rails: Readonly<Record<string, number>>, t: Target, wave: (output: string) => WaveReading): number | undefined {
  if (t.stage === 'rails') return t.check.endsWith('.dc') ? rails[t.check.slice(6, -3)] : undefined;
  const stage = plan.stages.find((s) => s.id === t.stage);
  if (!stage) return undefined;
  const key = t.check.slice(stage.id.length + 1);
  if (stage.kind === 'schmitt-integrator') {
    const sq = wave(`${stage.id}.square`);
    if (key === 'freq') return sq.frequency;
    if (key === 'square.vpp') return sq.vpp;
    if (key === 'square.high') return sq.periodic ? sq.high : sq.mean;
    if (key === 'square.low') return sq.periodic ? sq.low : sq.mean;
    if (key === 'duty') return sq.periodic ? sq.duty : undefined;
    if (key === 'triangle.vpp') return wave(`${stage.id}.triangle`).vpp;
    return undefined;
  }
  const out = wave(`${stage.id}.out`);
  if (key === 'out.vpp') return out.vpp;
  if (key === 'out.dc') return out.mean;
  if (key === 'freq') return out.frequency;
  if (stage.kind === 'diode-shaper') {
    if (key === 'out.thd') return out.periodic ? out.thd : undefined;
    if (key === 'out.peak') return out.max;
  }
  if (key === 'gain' && stage.input) {
    // A gain is read only on an undistorted output: a clipped one has none.
    const input = wave(`${stage.input.stage}.${stage.input.output}`);
    const high = Math.max(...Object.values(rails)) - stage.opamp.headroom;
    const low = Math.min(...Object.values(rails)) + stage.opamp.headroom;
    if (!input.periodic || input.vpp < 0.01 || out.max > high - 0.05 || out.min < low + 0.05) return undefined;
    return ((stage.kind === 'inverting-amp' ? -1 : 1) * out.vpp) / input.vpp;
  }
  return undefined;
}

function rankOf(d: Diagnosis, part: string | null): number {
  if (part === null) return 0;
  const i = d.hypotheses.findIndex((h) => h.part === part || h.alternatives.some((a) => a.part === part));
  return i + 1;
}

const outcomes: Outcome[] = [];

beforeAll(() => {
  for (const [key, json] of Object.entries(faultSetPlans)) {
    plans[key] = loadPlanText(JSON.stringify(json), `fault set ${key}`);
    targets[key] = computeTargets(plans[key] as Plan, { trials: 2000 }).targets;
  }
  [...faultCases, ...healthyCases].forEach((c, i) => {
    const readings = simulate(c, 1000 + i);
    const d = diagnose(plans[c.plan] as Plan, targets[c.plan] as readonly Target[], readings, { top: 5 });
    outcomes.push({ c, readings, d, rank: rankOf(d, c.part) });
    if (process.env.DIAG_DEBUG && rankOf(d, c.part) === 0 && c.part) console.log(c.name, JSON.stringify(readings));
  });
  const rows = outcomes.map((o) => {
    const top = o.d.hypotheses[0];
    const named = top
      ? `${top.part} ${top.mode}${top.value !== null ? ` ${top.value.toPrecision(3)}` : ''}`
      : o.d.unexplained.length > 0
        ? `unexplained: ${o.d.unexplained.join(', ')}`
        : '(none)';
    return `| ${o.c.name} | ${o.c.kind} | ${o.c.part ?? '—'} | ${o.c.part === null ? '—' : o.rank === 0 ? 'missed' : o.rank} | ${named} | ${o.d.hypotheses.length} |`;
  });
  console.log(['| board | fault kind | planted | rank | named first | listed |', '| --- | --- | --- | --- | --- | --- |', ...rows].join('\n'));
}, 600_000);

describe('diagnosis on ngspice-simulated single-fault boards', () => {
  test('the set is large enough and spread over the fault kinds', () => {
    expect(faultCases.length).toBeGreaterThanOrEqual(30);
    expect(new Set(faultCases.map((c) => c.kind)).size).toBeGreaterThanOrEqual(8);
  });

  test('the planted part is in the top 3 for at least 90 % of the boards and first for at least 70 %', () => {
    const faulted = outcomes.filter((o) => o.c.part !== null);
    const top3 = faulted.filter((o) => o.rank >= 1 && o.rank <= 3).length / faulted.length;
    const first = faulted.filter((o) => o.rank === 1).length / faulted.length;
    expect(top3).toBeGreaterThanOrEqual(0.9);
    expect(first).toBeGreaterThanOrEqual(0.7);
  });

  test('no listed hypothesis contradicts a reading', () => {
    for (const o of outcomes) {
      const plan = plans[o.c.plan] as Plan;
      for (const h of o.d.hypotheses) {
        for (const r of o.readings) {
          const t = (targets[o.c.plan] as readonly Target[]).find((x) => x.check === r.check) as Target;
          const predicted = h.predicted[r.check];
          if (predicted === undefined) continue;
          // Written here, not taken from the diagnosis: the reading's U, the statistical band's
          // half-width (the other parts' spread) scaled to the predicted level, and 2 % + 10 mV
          // for the model (10 % for a THD, whose residual harmonics hang on the diode knee), 5 %
          // more for a part open, shorted, backwards or missing, whose junction drops the plan's
          // tolerances do not describe (common practice, no source).
          const p = Number.isFinite(predicted) ? predicted : 0;
          const scale = t.nominal !== 0 ? Math.min(10, Math.abs(p / t.nominal)) : 1;
          const u = uncertaintyOf(r.value, uncertaintyFor(plan, r.check, uncertaintyKey(t.unit)) ?? { relative: 0, absolute: 0 });
          const model = (r.check.endsWith('.thd') ? 0.1 : 0.02) + (h.mode === 'value' ? 0 : 0.05);
          const allowed = u + ((t.stat.max - t.stat.min) / 2) * scale + model * Math.abs(p) + 0.01;
          expect(Math.abs(r.value - p), `${o.c.name}: ${h.part} ${h.mode} predicts ${r.check} = ${p}, read ${r.value}`).toBeLessThanOrEqual(allowed);
        }
      }
    }
  });

  test('a healthy board reads inside its bands and gets no hypothesis', () => {
    for (const o of outcomes.filter((x) => x.c.part === null)) {
      expect(
        o.readings.filter((r) => r.verdict === 'fail'),
        o.c.name,
      ).toEqual([]);
      expect(o.d.hypotheses, o.c.name).toEqual([]);
    }
  });
});
