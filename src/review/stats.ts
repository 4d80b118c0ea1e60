/** Location and spread of a set of readings, in their unit. */
export interface Spread {
  readonly n: number;
  /** Null when there are no values. */
  readonly mean: number | null;
  /** Sample standard deviation (n − 1); null when n < 2. */
  readonly sd: number | null;
  readonly min: number | null;
  readonly max: number | null;
}

/**
 * Mean, sample standard deviation, min and max. Two passes (mean, then squared
 * deviations) rather than a running sum of squares: readings of a 10 kHz
 * oscillator spread by a few hertz would lose their digits in x² sums.
 */
export function spreadOf(values: ArrayLike<number>): Spread {
  const n = values.length;
  if (n === 0) return { n, mean: null, sd: null, min: null, max: null };
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i] as number;
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const mean = sum / n;
  if (n < 2) return { n, mean, sd: null, min, max };
  let squares = 0;
  for (let i = 0; i < n; i++) squares += ((values[i] as number) - mean) ** 2;
  return { n, mean, sd: Math.sqrt(squares / (n - 1)), min, max };
}
