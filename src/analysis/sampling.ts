import { type Chain, spreadOf } from '../plan/chain.js';
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
  const nCheck = chain.checks.length;
  const varied = Int32Array.from(chain.variables.flatMap((v, i) => (spreadOf(v) > 0 ? [i] : [])));
  const spread = Float64Array.from(varied, (i) => {
    const v = chain.variables[i];
    return v ? spreadOf(v) : 0;
  });
  const x = Float64Array.from(chain.nominal);
  const out = new Float64Array(nCheck);
  const values = Array.from({ length: nCheck }, () => new Float64Array(trials));
  const missing = new Int32Array(nCheck);
  const step = Math.max(1000, Math.floor(trials / 20));
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
 * The extremes and two quantiles of the finite values of one check (linear
 * interpolation between order statistics, Hyndman and Fan type 7, the default
 * of R and NumPy).
 */
export interface TailFigures {
  readonly min: number;
  readonly max: number;
  readonly low: number;
  readonly high: number;
}

/**
 * The type 7 quantiles at `pLow` and `pHigh` and the extremes of the finite
 * values, without sorting: the order statistics the two quantiles need are found by
 * selection (Hoare's quickselect, expected O(n)) on a copy of the finite values.
 * The same numbers as a full sort, since an order statistic is one value.
 */
export function tailFigures(values: Float64Array, pLow: number, pHigh: number): TailFigures {
  // Indexed loops, one pass: this runs once per check in a one-shot command, where an
  // iterator loop over 10,000 values runs unoptimised (about 40 ms over a plan, measured).
  const a = new Float64Array(values.length);
  let n = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as number;
    // v − v is 0 for a finite v, NaN for ±∞ and NaN.
    if (v - v !== 0) continue;
    a[n++] = v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (n === 0) return { min: Number.NaN, max: Number.NaN, low: Number.NaN, high: Number.NaN };
  const finite = a.subarray(0, n);
  return { min, max, low: quantileAt(finite, pLow), high: quantileAt(finite, pHigh) };
}

/** Order statistics this close to either end are read from one pass with a short sorted buffer instead of a selection. */
const nearEnd = 64;

/**
 * Type 7 quantile of the finite values `a` (may reorder them). The statistical band's
 * quantiles (0.135 % and 99.865 %) need the 14th and 15th values from either end: one
 * pass keeping the smallest (or largest) few in order finds them, the same order
 * statistics a selection finds, in a fraction of its time.
 */
function quantileAt(a: Float64Array, p: number): number {
  const n = a.length;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  const fromTop = n - 1 - lo;
  if (hi + 1 <= nearEnd) {
    const k = hi + 1;
    const least = smallest(a, k, 1);
    const x = least[lo] as number;
    return x + (h - lo) * ((least[hi] as number) - x);
  }
  if (fromTop + 1 <= nearEnd) {
    // The largest fromTop + 1 values, largest first: a[lo] is the last of them, a[hi] the one before.
    const most = smallest(a, fromTop + 1, -1);
    const x = most[fromTop] as number;
    const y = most[n - 1 - hi] as number;
    return x + (h - lo) * (y - x);
  }
  return quantileBySelection(a, p);
}

let keep = new Float64Array(nearEnd);

/** The k smallest values of `a` in ascending order (sign 1), or the k largest in descending order (sign −1). */
function smallest(a: Float64Array, k: number, sign: 1 | -1): Float64Array {
  if (keep.length < k) keep = new Float64Array(k);
  const b = keep;
  let m = 0;
  for (let i = 0; i < a.length; i++) {
    const v = sign * (a[i] as number);
    if (m === k && v >= (b[k - 1] as number)) continue;
    // Insertion into the sorted buffer (ties keep their order, as any sort of the values would give the same numbers).
    let j = m < k ? m++ : k - 1;
    while (j > 0 && (b[j - 1] as number) > v) {
      b[j] = b[j - 1] as number;
      j--;
    }
    b[j] = v;
  }
  if (sign < 0) for (let i = 0; i < m; i++) b[i] = -(b[i] as number);
  return b;
}

/** Type 7 quantile of `a` (finite values, reordered in place). */
function quantileBySelection(a: Float64Array, p: number): number {
  const n = a.length;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  select(a, lo);
  const x = a[lo] as number;
  // After selection everything right of `lo` is at least a[lo]: the next order statistic is their least.
  let y = x;
  if (hi > lo) {
    y = Infinity;
    for (let i = lo + 1; i < n; i++) if ((a[i] as number) < y) y = a[i] as number;
  }
  return x + (h - lo) * (y - x);
}

/** Reorder `a` so that a[k] is its k-th smallest, smaller ones left of it and larger ones right. */
function select(a: Float64Array, k: number): void {
  let left = 0;
  let right = a.length - 1;
  while (right > left) {
    // Median of three as the pivot keeps sorted and reversed runs linear.
    const mid = (left + right) >>> 1;
    const p = median3(a[left] as number, a[mid] as number, a[right] as number);
    let i = left;
    let j = right;
    while (i <= j) {
      while ((a[i] as number) < p) i++;
      while ((a[j] as number) > p) j--;
      if (i <= j) {
        const t = a[i] as number;
        a[i] = a[j] as number;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return;
  }
}

function median3(x: number, y: number, z: number): number {
  if (x < y) return y < z ? y : x < z ? z : x;
  return x < z ? x : y < z ? z : y;
}
