import type { Chain } from '../plan/chain.js';
import { type Distribution, createRandom, drawDeviation } from './random.js';

/** Monte Carlo results: one Float64Array of values per check (chain order), and the count of failed trials per check. */
export interface Samples {
  readonly values: readonly Float64Array[];
  /** Trials in which a check had no finite value (NaN), per check. */
  readonly missing: Int32Array;
  readonly trials: number;
}

export interface SampleOptions {
  readonly trials: number;
  readonly seed: number;
  readonly distribution: Distribution;
  /** Called every few thousand trials, for progress on long runs. */
  readonly onProgress?: (done: number, total: number) => void;
}

/**
 * Seeded Monte Carlo over every toleranced variable of the chain at once
 * (after JCGM 101:2008, propagation of distributions): each trial draws every
 * variable, evaluates the whole chain once, and stores every check's value.
 * Arrays are preallocated; the loop creates no objects of its own.
 */
export function sampleChain(chain: Chain, options: SampleOptions): Samples {
  const { trials, seed, distribution, onProgress } = options;
  const random = createRandom(seed);
  const nVar = chain.variables.length;
  const nCheck = chain.checks.length;
  const varied = Int32Array.from(
    chain.variables.flatMap((v, i) => (v.tol > 0 ? [i] : [])),
  );
  const spread = Float64Array.from(varied, (i) => (chain.variables[i]?.nominal ?? 0) * (chain.variables[i]?.tol ?? 0));
  const x = Float64Array.from(chain.nominal);
  const out = new Float64Array(nCheck);
  const values = Array.from({ length: nCheck }, () => new Float64Array(trials));
  const missing = new Int32Array(nCheck);
  const step = Math.max(1000, Math.floor(trials / 20));
  void nVar;
  for (let t = 0; t < trials; t++) {
    for (let k = 0; k < varied.length; k++) {
      const i = varied[k] as number;
      x[i] = (chain.nominal[i] as number) + (spread[k] as number) * drawDeviation(random, distribution);
    }
    chain.evaluate(x, out);
    for (let c = 0; c < nCheck; c++) {
      const v = out[c] as number;
      (values[c] as Float64Array)[t] = v;
      if (!Number.isFinite(v)) missing[c] = (missing[c] ?? 0) + 1;
    }
    if (onProgress && (t + 1) % step === 0) onProgress(t + 1, trials);
  }
  return { values, missing, trials };
}

/**
 * Quantile of the finite values (linear interpolation between order statistics,
 * Hyndman and Fan type 7, the default of R and NumPy). `sorted` must be
 * ascending with non-finite values removed.
 */
export function quantileSorted(sorted: Float64Array, p: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  const a = sorted[lo] as number;
  const b = sorted[hi] as number;
  return a + (h - lo) * (b - a);
}

/** The finite values of one check, sorted ascending. */
export function sortedFinite(values: Float64Array): Float64Array {
  let n = 0;
  for (const v of values) if (Number.isFinite(v)) n++;
  const out = new Float64Array(n);
  let j = 0;
  for (const v of values) if (Number.isFinite(v)) out[j++] = v;
  return out.sort();
}
