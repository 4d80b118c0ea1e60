import type { BatchPoint } from './batch-types.js';

export interface TrendSeries {
  readonly values: readonly number[];
  readonly serials: readonly string[];
  /** ISO times of the first and last point, or null when empty. */
  readonly first: string | null;
  readonly last: string | null;
}

/**
 * The latest reading of each board, oldest first, thinned to at most `max`
 * points by averaging neighbours, so a chart 60 columns wide still shows a drift
 * across 10,000 boards (a plain stride would alias a periodic lot pattern).
 */
export function trendOf(points: readonly BatchPoint[], max = Infinity): TrendSeries {
  const sorted = points
    .filter((p) => Number.isFinite(p.value))
    .map((p) => ({ p, t: Date.parse(p.at) }))
    .sort((a, b) => a.t - b.t || (a.p.serial < b.p.serial ? -1 : 1))
    .map((x) => x.p);
  const first = sorted[0]?.at ?? null;
  const last = sorted[sorted.length - 1]?.at ?? null;
  const limit = Math.max(1, Math.floor(max));
  if (sorted.length <= limit) return { values: sorted.map((p) => p.value), serials: sorted.map((p) => p.serial), first, last };
  const values: number[] = [];
  const serials: string[] = [];
  for (let k = 0; k < limit; k++) {
    const a = Math.floor((k * sorted.length) / limit);
    const b = Math.floor(((k + 1) * sorted.length) / limit);
    let sum = 0;
    for (let i = a; i < b; i++) sum += sorted[i]?.value ?? 0;
    values.push(sum / (b - a));
    serials.push(sorted[a]?.serial ?? '');
  }
  return { values, serials, first, last };
}
