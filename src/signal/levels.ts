/** Lowest and highest sample in [from, to). */
export function extremes(x: Float64Array, from = 0, to = x.length): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = from; i < to; i++) {
    const v = x[i] as number;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

export interface Moments {
  readonly mean: number;
  /** Total RMS (DC + AC), as a true-RMS meter reads. */
  readonly rms: number;
  /** RMS with the mean removed. */
  readonly rmsAc: number;
  /** Mean absolute deviation from the mean, for the form factor. */
  readonly meanAbs: number;
}

/** Mean, RMS, AC RMS and mean absolute deviation over [from, to). */
export function moments(x: Float64Array, from = 0, to = x.length): Moments {
  const n = to - from;
  let sum = 0;
  for (let i = from; i < to; i++) sum += x[i] as number;
  return momentsAbout(x, from, to, sum / n);
}

/** `moments` given the mean over [from, to): the second pass alone. */
export function momentsAbout(x: Float64Array, from: number, to: number, mean: number): Moments {
  const n = to - from;
  // Second pass about the mean: no cancellation for a small AC part on a large DC level.
  let sq = 0;
  let abs = 0;
  for (let i = from; i < to; i++) {
    const d = (x[i] as number) - mean;
    sq += d * d;
    abs += Math.abs(d);
  }
  const acSquare = sq / n;
  return { mean, rms: Math.sqrt(acSquare + mean * mean), rmsAc: Math.sqrt(acSquare), meanAbs: abs / n };
}

/**
 * Low and high state levels by the histogram method of IEEE Std 181-2011
 * (§5.2, from memory): the modes of the lower and upper halves of the sample
 * histogram. The mode is refined to the mean of the samples in the modal bin.
 */
export function stateLevels(x: Float64Array, from = 0, to = x.length, bins = 256): { low: number; high: number } {
  const { min, max } = extremes(x, from, to);
  if (!(max > min)) return { low: min, high: max };
  const width = (max - min) / bins;
  const count = new Float64Array(bins);
  const total = new Float64Array(bins);
  for (let i = from; i < to; i++) {
    const v = x[i] as number;
    const b = Math.min(bins - 1, Math.floor((v - min) / width));
    count[b] = (count[b] as number) + 1;
    total[b] = (total[b] as number) + v;
  }
  const mode = (a: number, b: number): number => {
    let best = a;
    for (let i = a; i < b; i++) if ((count[i] as number) > (count[best] as number)) best = i;
    return (total[best] as number) / (count[best] as number);
  };
  return { low: mode(0, bins / 2), high: mode(bins / 2, bins) };
}
