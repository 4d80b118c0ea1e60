import { type Chain, type ChainDetail, buildChain } from '../plan/chain.js';
import { upstreamOf } from '../plan/stages.js';
import type { Plan } from '../plan/types.js';
import type { Distribution } from './random.js';
import { type Samples, sampleChain, tailFigures } from './sampling.js';
import { contributorsOf, sensitivities } from './sensitivity.js';
import type { DesignWarning, Target, TargetSet } from './types.js';
import { cornerWarnings } from './corner-warnings.js';
import { designWarnings } from './warnings.js';
import { type WorstCase, worstCase } from './worst-case.js';
import { formatValue } from '../units/format.js';

export interface TargetOptions {
  /** Monte Carlo trials. @default 10000 */
  readonly trials?: number;
  /** PRNG seed; the same seed gives the same numbers. @default 1 */
  readonly seed?: number;
  /** How parts spread within their tolerance. @default 'normal' */
  readonly distribution?: Distribution;
  /** Progress of the Monte Carlo, for long runs. */
  readonly onProgress?: (done: number, total: number) => void;
}

export const defaultTrials = 10_000;
export const defaultSeed = 1;

/** The coverage interval of the statistical band: 0.135 % … 99.865 %, the ±3σ probabilities of a normal. */
export const statCoverage = { low: 0.00135, high: 0.99865 } as const;

/**
 * Targets for every check of a plan, in safe bring-up order (DESIGN §4, §5).
 *
 * - Unpowered `rails.<id>.to-ground` (Ω): min = plan.railShortMin, max = +∞.
 *   Their nominal is that threshold (the plan gives no expected resistance).
 * - `rails.idle-current` (A): 0 … idleCurrent.max (+∞ when the plan sets none);
 *   its nominal is the middle of that band (the plan gives only a limit).
 * - `rails.<id>.dc` and every stage check: nominal from the chain at nominal
 *   values; worst-case band from a deterministic search of the tolerance box
 *   (see `worstCase`: the same for any trial count or seed), with the method
 *   that bound it; statistical band the 0.135–99.865 % interval of a seeded
 *   Monte Carlo over all variables at once, held inside the worst-case band.
 *
 * The first two are limit checks (`isLimit`): callers show no deviation from
 * their nominal. Unbounded band sides are ±Infinity here; `targetsJson` writes them as null.
 */
export function computeTargets(plan: Plan, options: TargetOptions = {}): TargetSet {
  const trials = options.trials ?? defaultTrials;
  const seed = options.seed ?? defaultSeed;
  if (!Number.isSafeInteger(trials) || trials < 1) throw new RangeError(`trials must be a whole number of at least 1, got ${trials}`);
  // The result is a pure function of the plan and the options: screens that ask again get the same object.
  const key = `${trials}|${seed}|${options.distribution ?? 'normal'}`;
  const cached = memo.get(plan)?.get(key);
  if (cached) return cached;
  const set = compute(plan, trials, seed, options);
  const byOptions = memo.get(plan) ?? new Map<string, TargetSet>();
  byOptions.set(key, set);
  memo.set(plan, byOptions);
  return set;
}

/** Results by plan object (dropped with the plan) and by options. */
const memo = new WeakMap<Plan, Map<string, TargetSet>>();

function compute(plan: Plan, trials: number, seed: number, options: TargetOptions): TargetSet {
  const prepared = prepareTargets(plan);
  const samples = sampleChain(prepared.chain, {
    trials,
    seed,
    distribution: options.distribution ?? 'normal',
    ...(options.onProgress ? { onProgress: options.onProgress } : {}),
  });
  return finishTargets(prepared, samples);
}

/**
 * Everything of a plan's targets but the Monte Carlo: the chain, the nominal, the
 * sensitivities and the worst case. With `finishTargets` and the samples of
 * `sampleChain` (the same chain built anywhere from the same plan, e.g. in a
 * worker thread, gives the same samples for the same seed) it is `computeTargets`.
 */
export interface PreparedTargets {
  readonly plan: Plan;
  readonly chain: Chain;
  readonly nominalDetail: ChainDetail;
  readonly nominalOut: Float64Array;
  readonly perSigma: readonly Float64Array[];
  readonly worst: WorstCase;
}

export function prepareTargets(plan: Plan): PreparedTargets {
  const chain = buildChain(plan);
  // The nominal from the exact evaluation (the hot path solves the shaper to bench accuracy only).
  const nominalDetail = chain.detail(chain.nominal);
  const nominalOut = Float64Array.from(chain.checks, (c) => nominalDetail.values[c.check] ?? Number.NaN);

  const perSigma = sensitivities(chain);
  // The worst case is its own deterministic search of the tolerance box: it never depends on the Monte Carlo.
  // Upstream stages, and the downstream ones whose inputs load this stage's chain (their parts move its checks too).
  const worst = worstCase(chain, perSigma, { upstream: (id) => [...upstreamOf(plan.stages, id), ...chain.loaders(id)] });
  return { plan, chain, nominalDetail, nominalOut, perSigma, worst };
}

/** The targets from a preparation and the Monte Carlo samples of its chain (in chain check order). */
export function finishTargets(prepared: PreparedTargets, samples: Samples): TargetSet {
  const n = prepared.chain.checks.length;
  if (samples.values.length !== n) throw new RangeError(`samples for ${samples.values.length} checks, the chain has ${n}`);
  return assembleTargets(prepared, (i) => tailFigures(samples.values[i] as Float64Array, statCoverage.low, statCoverage.high), samples.missing, samples.trials);
}

/** The two ends of check i's statistical band before they are held inside the worst case. */
export type StatBand = (i: number) => { readonly low: number; readonly high: number };

/**
 * The target set from a preparation and a statistical band per check: `missing[i]`
 * trials of `trials` gave check i no value (one warning per stage says so).
 */
export function assembleTargets(prepared: PreparedTargets, stat: StatBand, missingCounts: Int32Array, trials: number): TargetSet {
  const { plan, chain, nominalDetail, nominalOut, perSigma, worst } = prepared;
  // Checks without a value in some trials, by stage: one warning per stage, not per check.
  const gaps = new Map<string, { most: number; checks: string[] }>();
  const targets: Target[] = chain.checks.map((c, i) => {
    const upstream = c.stage === 'rails' ? [] : upstreamOf(plan.stages, c.stage);
    const stage = plan.stages.find((s) => s.id === c.stage);
    const base = {
      check: c.check,
      stage: c.stage,
      quantity: c.quantity,
      unit: c.unit,
      testPoint: c.testPoint,
      instrument: c.instrument,
      how: c.how,
      phase: c.phase,
      isLimit: c.phase === 'unpowered' || c.phase === 'first-power',
      ...(c.floor === undefined ? {} : { floor: c.floor }),
      upstream,
      ...(stage?.input ? { input: `${stage.input.stage}.${stage.input.output}` } : {}),
      ...(c.captureFigure ? { captureFigure: c.captureFigure } : {}),
      ...(c.isDesignFigure ? { isDesignFigure: true } : {}),
    };
    if (c.phase === 'unpowered') {
      const band = { min: plan.railShortMin, max: Infinity };
      return { ...base, nominal: plan.railShortMin, worst: band, stat: band, contributors: [] };
    }
    if (c.phase === 'first-power') {
      const max = plan.idleCurrentMax ?? Infinity;
      const band = { min: 0, max };
      return { ...base, nominal: Number.isFinite(max) ? max / 2 : 0, worst: band, stat: band, contributors: [] };
    }
    const nominal = nominalOut[i] as number;
    const tails = stat(i);
    const lo = finiteMin(worst.min[i] as number, nominal);
    const hi = finiteMax(worst.max[i] as number, nominal);
    // The statistical band lies inside the worst case by construction (every trial is a point of
    // the box); a quantile past a searched bound can only be the search's shortfall or rounding
    // between the two evaluation paths, so it is held to the bound rather than moving it.
    const statMin = Number.isFinite(tails.low) ? Math.min(Math.max(tails.low, lo), hi) : tails.low;
    const statMax = Number.isFinite(tails.high) ? Math.max(Math.min(tails.high, hi), lo) : tails.high;
    const missing = missingCounts[i] ?? 0;
    if (missing > 0) {
      const entry = gaps.get(c.stage) ?? { most: 0, checks: [] };
      entry.most = Math.max(entry.most, missing);
      entry.checks.push(c.check);
      gaps.set(c.stage, entry);
    }
    return {
      ...base,
      nominal,
      worst: { min: lo, max: hi },
      stat: { min: statMin, max: statMax },
      // A hand-written target's spread is its own band, not any part's.
      contributors: stage?.module.traits?.isHandWritten ? [] : contributorsOf(chain, perSigma, i, nominal),
      ...(worst.method[i] ? { method: worst.method[i] } : {}),
    };
  });

  const extra: DesignWarning[] = [...gaps].map(([stage, g]) => {
    const cause = stage === 'rails' ? undefined : upstreamOf(plan.stages, stage).find((u) => gaps.has(u));
    const why = cause ? `its input from ${cause} stops at some tolerance corners` : 'the stage stops working at some tolerance corners';
    return {
      stage,
      message: `in up to ${g.most} of ${trials} trials (${formatPercentOf(g.most, trials)}) ${g.checks.join(', ')} had no value: ${why}; the bands cover the trials that work`,
    };
  });
  const warnings = [...designWarnings(plan, nominalDetail), ...cornerWarnings(chain, perSigma, nominalDetail), ...extra];
  for (const t of targets) {
    if (t.phase === 'stage' && !Number.isFinite(t.nominal)) {
      warnings.push({ stage: t.stage, message: `${t.check} has no nominal value (${formatValue(t.nominal, t.unit)}): check the stage's parts and input` });
    }
  }
  return { plan: plan.plan, targets, warnings };
}

function formatPercentOf(part: number, whole: number): string {
  const pct = (100 * part) / whole;
  return `${pct < 1 ? pct.toPrecision(1) : Math.round(pct)} %`;
}

/** The least finite value (Math.min would turn one NaN into a NaN band); NaN when none is finite. */
function finiteMin(...values: number[]): number {
  let m = Infinity;
  for (const v of values) if (Number.isFinite(v) && v < m) m = v;
  return m === Infinity ? Number.NaN : m;
}

function finiteMax(...values: number[]): number {
  let m = -Infinity;
  for (const v of values) if (Number.isFinite(v) && v > m) m = v;
  return m === -Infinity ? Number.NaN : m;
}
