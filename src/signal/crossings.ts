/** Crossing times of a level, as fractional sample indices. */
export interface Crossings {
  readonly rising: Float64Array;
  readonly falling: Float64Array;
}

/**
 * Crossings of `level` with hysteresis: a crossing counts once the signal has
 * gone from below `lo` to above `hi` (or back), `lo` ≤ `level` ≤ `hi`. Its time is
 * the last pass through `level` on the way, interpolated linearly between the
 * two samples around it, so noise on a slow edge does not make extra crossings.
 */
export function crossings(x: Float64Array, level: number, lo: number, hi: number, from = 0, to = x.length): Crossings {
  const rising: number[] = [];
  const falling: number[] = [];
  let state = 0; // −1 below, +1 above, 0 not yet known
  let lastBelow = -1; // last index with x < level
  let lastAbove = -1; // last index with x ≥ level
  for (let i = from; i < to; i++) {
    const v = x[i] as number;
    if (v < level) lastBelow = i;
    else lastAbove = i;
    if (v > hi) {
      if (state === -1 && lastBelow >= 0 && lastBelow + 1 < to) rising.push(interpolate(x, lastBelow, level));
      state = 1;
    } else if (v < lo) {
      if (state === 1 && lastAbove >= 0 && lastAbove + 1 < to) falling.push(interpolate(x, lastAbove, level));
      state = -1;
    }
  }
  return { rising: Float64Array.from(rising), falling: Float64Array.from(falling) };
}

function interpolate(x: Float64Array, i: number, level: number): number {
  const a = x[i] as number;
  const b = x[i + 1] as number;
  return b === a ? i + 0.5 : i + (level - a) / (b - a);
}

/**
 * The period in samples from successive crossing times: the least-squares slope
 * of time against crossing number, which uses every crossing, not just the ends.
 */
export function periodFromCrossings(times: Float64Array): number {
  const n = times.length;
  const meanK = (n - 1) / 2;
  let meanT = 0;
  for (let k = 0; k < n; k++) meanT += times[k] as number;
  meanT /= n;
  let num = 0;
  let den = 0;
  for (let k = 0; k < n; k++) {
    num += (k - meanK) * ((times[k] as number) - meanT);
    den += (k - meanK) ** 2;
  }
  return num / den;
}
