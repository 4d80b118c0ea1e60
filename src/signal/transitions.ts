/** Rise and fall times and overshoot of a two-level signal. */
export interface Transitions {
  /** Median 10–90 % rise time, samples. */
  readonly rise: number;
  /** Median 90–10 % fall time, samples. */
  readonly fall: number;
  /** Median overshoot after rising edges, fraction of the amplitude (0 when none). */
  readonly overshoot: number;
  /** Median undershoot after falling edges, fraction of the amplitude. */
  readonly undershoot: number;
}

const maxEdges = 2000;

/**
 * Transition durations per IEEE Std 181-2011 (§5.3, from memory): reference
 * levels at 10 % and 90 % of the amplitude between the low and high state
 * levels; each edge's duration is the time between its last pass through the
 * first reference level and its first pass through the second, interpolated
 * between samples. Overshoot is the largest excursion beyond the state level
 * that follows, within the next half period, over the amplitude.
 */
export function transitions(x: Float64Array, rising: Float64Array, falling: Float64Array, low: number, high: number, period: number): Transitions {
  const amplitude = high - low;
  const r10 = low + 0.1 * amplitude;
  const r90 = low + 0.9 * amplitude;
  const span = Math.max(2, Math.floor(period / 2));
  const rises: number[] = [];
  const falls: number[] = [];
  const overs: number[] = [];
  const unders: number[] = [];
  const n = x.length;
  for (let e = 0; e < rising.length && e < maxEdges; e++) {
    const m = rising[e] as number;
    const i10 = lastIndex(x, Math.floor(m), Math.max(0, Math.floor(m) - span), (v) => v < r10);
    const i90 = firstIndex(x, Math.ceil(m), Math.min(n - 1, Math.ceil(m) + span), (v) => v >= r90);
    if (i10 < 0 || i90 < 0 || i10 + 1 >= n) continue;
    rises.push(cross(x, i90 - 1, r90) - cross(x, i10, r10));
    overs.push(Math.max(0, (peak(x, Math.ceil(m), Math.min(n, Math.ceil(m) + Math.floor(span * 0.9)), 1) - high) / amplitude));
  }
  for (let e = 0; e < falling.length && e < maxEdges; e++) {
    const m = falling[e] as number;
    const i90 = lastIndex(x, Math.floor(m), Math.max(0, Math.floor(m) - span), (v) => v > r90);
    const i10 = firstIndex(x, Math.ceil(m), Math.min(n - 1, Math.ceil(m) + span), (v) => v <= r10);
    if (i10 < 0 || i90 < 0 || i90 + 1 >= n) continue;
    falls.push(cross(x, i10 - 1, r10) - cross(x, i90, r90));
    unders.push(Math.max(0, (low - peak(x, Math.ceil(m), Math.min(n, Math.ceil(m) + Math.floor(span * 0.9)), -1)) / amplitude));
  }
  return { rise: median(rises), fall: median(falls), overshoot: median(overs), undershoot: median(unders) };
}

/** Last index from `start` down to `stop` where the test holds, or −1. */
function lastIndex(x: Float64Array, start: number, stop: number, test: (v: number) => boolean): number {
  for (let i = start; i >= stop; i--) if (test(x[i] as number)) return i;
  return -1;
}

function firstIndex(x: Float64Array, start: number, stop: number, test: (v: number) => boolean): number {
  for (let i = start; i <= stop; i++) if (test(x[i] as number)) return i;
  return -1;
}

/** Where the line from sample i to i + 1 passes `level`. */
function cross(x: Float64Array, i: number, level: number): number {
  const a = x[i] as number;
  const b = x[i + 1] as number;
  return b === a ? i : i + (level - a) / (b - a);
}

function peak(x: Float64Array, from: number, to: number, sign: 1 | -1): number {
  let best = -Infinity;
  for (let i = from; i < to; i++) best = Math.max(best, sign * (x[i] as number));
  return sign * best;
}

function median(values: number[]): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}
