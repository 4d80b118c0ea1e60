import type { Chain } from '../plan/chain.js';
import type { Plan } from '../plan/types.js';
import { uncertaintyOf } from '../units/uncertainty.js';
import { type Unit, uncertaintyKey } from '../units/unit.js';
import type { Target, Verdict } from './types.js';
import { uncertaintyFor } from './verdict.js';

/** One reading the diagnosis weighs: the latest of its check in the run. */
export interface DiagnosisReading {
  readonly check: string;
  /** SI base units. */
  readonly value: number;
  readonly verdict: Verdict;
}

/** What the diagnosis needs of a check's target: its band (a `Target`, or the review's cached `CheckBand`). */
export type DiagnosisTarget = Pick<Target, 'check' | 'unit' | 'nominal' | 'worst' | 'stat'> & { readonly isLimit?: boolean };

/** A reading made ready for comparing predictions against it. */
export interface Evidence {
  readonly check: string;
  /** Index of the check in the chain's `checks`. */
  readonly index: number;
  readonly value: number;
  readonly verdict: Verdict;
  readonly unit: Unit;
  /** The check's stage id, or `rails`. */
  readonly stage: string;
  readonly target: DiagnosisTarget;
  /** The reading's expanded uncertainty U, in its unit. */
  readonly u: number;
  /** Standard deviation of the healthy board's spread at this check (statistical band / 6). */
  readonly spread: number;
  /** Whether the reading lies outside its band (fail or marginal): it asks for an explanation. */
  readonly deviates: boolean;
}

/**
 * The model's own error per unit (DESIGN §5a "the model's own error"), as a
 * relative and an absolute part. Set from the ngspice comparisons of the kinds'
 * tests and of the fault set (test/analysis/diagnose-spice.test.ts), where the
 * models read within about 1 % of ngspice on frequency and levels, a few
 * percent on THD (a shaped wave's residual harmonics are sensitive to the knee).
 */
const modelError: Readonly<Partial<Record<Unit, { readonly rel: number; readonly abs: number }>>> = {
  Hz: { rel: 0.015, abs: 0 },
  V: { rel: 0.015, abs: 0.005 },
  'V/V': { rel: 0.01, abs: 0 },
  '1': { rel: 0.08, abs: 0.004 },
  A: { rel: 0.03, abs: 10e-6 },
  Ω: { rel: 0.01, abs: 0 },
};

/**
 * A part that is open, shorted, backwards or missing works where the plan's
 * tolerances say nothing about it (a zener conducting forward, a transistor
 * driven hard on): its junction drops spread by some tens of millivolts either
 * way (common practice, no source). Such a fault's predictions are held to
 * this much more relative error, on top of the model's own.
 */
export const faultModeError = 0.05;

export function modelErrorOf(unit: Unit, predicted: number, extra = 0): number {
  const m = modelError[unit] ?? { rel: 0.02, abs: 0 };
  return (m.rel + extra) * Math.abs(predicted) + m.abs;
}

/**
 * The readings the diagnosis can compare with a prediction: the latest per
 * check, with a modelled target (the unpowered and first-power limits have no
 * model value and are left to their hints).
 */
export function gatherEvidence(
  plan: Plan,
  chain: Chain,
  targets: readonly DiagnosisTarget[],
  readings: readonly DiagnosisReading[],
): { evidence: Evidence[]; unmodelled: DiagnosisReading[] } {
  const healthy = new Float64Array(chain.checks.length);
  chain.evaluate(chain.nominal, healthy);
  const latest = new Map<string, DiagnosisReading>();
  for (const r of readings) latest.set(r.check, r);
  const byCheck = new Map(targets.map((t) => [t.check, t] as const));
  const evidence: Evidence[] = [];
  const unmodelled: DiagnosisReading[] = [];
  for (const r of latest.values()) {
    const target = byCheck.get(r.check);
    const index = chain.checks.findIndex((c) => c.check === r.check);
    const check = chain.checks[index];
    const stage = plan.stages.find((s) => s.id === check?.stage);
    const handWritten = stage?.module.traits?.isHandWritten === true || stage?.kind === 'manual';
    if (!target || !check || target.isLimit || check.phase === 'unpowered' || check.phase === 'first-power' || handWritten || !Number.isFinite(r.value)) {
      unmodelled.push(r);
      continue;
    }
    const spec = uncertaintyFor(plan, r.check, uncertaintyKey(target.unit));
    const u = spec ? uncertaintyOf(r.value, spec) : 0;
    const width = Number.isFinite(target.stat.max - target.stat.min) ? target.stat.max - target.stat.min : 0;
    const e = {
      check: r.check,
      index,
      value: r.value,
      verdict: r.verdict,
      unit: target.unit,
      stage: check.stage,
      target,
      u,
      spread: width / 6,
      deviates: false,
    };
    // Outside its band, and not what a healthy board can read within the model's error: a marginal
    // reading the nominal board reproduces asks for no cause.
    evidence.push({ ...e, deviates: r.verdict === 'fail' || (r.verdict === 'marginal' && !reproduces(e, healthy[index] as number)) });
  }
  return { evidence, unmodelled };
}

/**
 * The standard deviation of a reading against a prediction: the instrument's
 * (U taken as two standard deviations, GUM k = 2), the other parts' spread
 * (scaled with the predicted level: the same tolerances move a smaller signal
 * less) and the model's error (taken as two standard deviations), root-sum-square
 * (JCGM 100:2008, combined standard uncertainty).
 */
export function sigmaOf(e: Evidence, predicted: number, extra = 0): number {
  const p = Number.isFinite(predicted) ? predicted : 0;
  const scale = e.target.nominal !== 0 && Number.isFinite(e.target.nominal) ? Math.min(10, Math.abs(p / e.target.nominal)) : 1;
  const spread = e.spread * scale;
  const model = modelErrorOf(e.unit, p, extra) / 2;
  const s = Math.sqrt((e.u / 2) ** 2 + spread ** 2 + model ** 2);
  // A floor so that an exact instrument on an exact check still has a finite likelihood.
  return Math.max(s, 1e-12 + 1e-6 * Math.abs(e.value));
}

/**
 * How far a prediction may sit from the reading and still reproduce it: the
 * reading's U, plus the model's error, plus three standard deviations of the
 * other parts' spread (they are still anywhere inside their tolerances).
 * A prediction of "no value" (NaN: an oscillator that stopped, a corner that
 * cannot be found) reproduces only a reading of about zero.
 */
export function reproduces(e: Evidence, predicted: number, extra = 0): boolean {
  const p = Number.isFinite(predicted) ? predicted : 0;
  const scale = e.target.nominal !== 0 && Number.isFinite(e.target.nominal) ? Math.min(10, Math.abs(p / e.target.nominal)) : 1;
  const allowed = e.u + modelErrorOf(e.unit, p, extra) + 3 * e.spread * scale;
  return Math.abs(e.value - p) <= allowed;
}

/**
 * The log-likelihood of the readings given one set of predictions: a sum of
 * Gaussian terms ln N(reading; predicted, σ), σ from `sigmaOf`
 * (the product of independent normal densities, any statistics text).
 */
export function logLikelihood(evidence: readonly Evidence[], predicted: Float64Array, extra = 0): number {
  let sum = 0;
  for (const e of evidence) sum += gaussianLog(e.value, predicted[e.index] ?? Number.NaN, sigmaOf(e, predicted[e.index] ?? Number.NaN, extra));
  return sum;
}

/** ln of the normal density N(x; μ, σ); a non-finite μ counts as 0 (no signal). */
export function gaussianLog(x: number, mu: number, sigma: number): number {
  const m = Number.isFinite(mu) ? mu : 0;
  const z = (x - m) / sigma;
  return -0.5 * z * z - Math.log(sigma) - 0.5 * Math.log(2 * Math.PI);
}

/** Whether a set of predictions reproduces every reading (DESIGN §5a verification). */
export function reproducesAll(evidence: readonly Evidence[], predicted: Float64Array, extra = 0): boolean {
  for (const e of evidence) if (!reproduces(e, predicted[e.index] ?? Number.NaN, extra)) return false;
  return true;
}
