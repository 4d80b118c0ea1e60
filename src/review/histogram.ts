import type { Band } from '../analysis/types.js';

export interface HistogramOptions {
  /** Number of bins. @default 10 */
  readonly bins?: number;
  /** The band; the bins always span it as well as the data, so its edges can be marked. */
  readonly band?: Band | null;
  readonly nominal?: number | null;
}

export interface HistogramBins {
  /** Lower edge of the first bin. */
  readonly lo: number;
  /** Upper edge of the last bin. */
  readonly hi: number;
  readonly width: number;
  /** Counts per bin; they sum to the number of finite values. */
  readonly counts: readonly number[];
  /** Values that were not finite numbers and were left out. */
  readonly dropped: number;
}

/**
 * Count readings into equal bins across the band and the data. Bins are
 * half-open [lo + i·w, lo + (i+1)·w) except the last, which also takes its
 * upper edge, so every value lands in exactly one bin.
 */
export function histogramBins(values: readonly number[], options: HistogramOptions = {}): HistogramBins {
  const bins = Math.max(1, Math.floor(options.bins ?? 10));
  let lo = Infinity;
  let hi = -Infinity;
  let dropped = 0;
  for (const v of values) {
    if (!Number.isFinite(v)) {
      dropped++;
      continue;
    }
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  for (const edge of [options.band?.min, options.band?.max, options.nominal]) {
    if (edge === undefined || edge === null || !Number.isFinite(edge)) continue;
    if (edge < lo) lo = edge;
    if (edge > hi) hi = edge;
  }
  if (lo === Infinity) return { lo: 0, hi: 0, width: 0, counts: new Array<number>(bins).fill(0), dropped };
  if (hi === lo) {
    // One value and nothing else: open a small window around it so it has a bin.
    const half = lo === 0 ? 1 : Math.abs(lo) * 0.01;
    lo -= half;
    hi += half;
  }
  const width = (hi - lo) / bins;
  const counts = new Array<number>(bins).fill(0);
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    const i = Math.min(bins - 1, Math.max(0, Math.floor((v - lo) / width)));
    counts[i] = (counts[i] ?? 0) + 1;
  }
  return { lo, hi, width, counts, dropped };
}

/** The bin a value falls in (same rule as the counting), for marking band edges. */
export function binOf(bins: HistogramBins, value: number): number {
  const n = bins.counts.length;
  if (bins.width === 0) return 0;
  return Math.min(n - 1, Math.max(0, Math.floor((value - bins.lo) / bins.width)));
}
