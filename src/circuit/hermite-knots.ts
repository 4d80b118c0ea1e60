/**
 * A curve known at evenly spaced knots (value and slope) and read between
 * them: the shaper's and the follower's trial transfer curves, the Lambert W table.
 */

/**
 * Cubic Hermite on each of `intervals` intervals of width `h` (any numerical analysis text),
 * as power-series coefficients in t ∈ [0, 1] written to `coef` (4 per interval):
 * p(t) = y0 + m0·t + (3Δ − 2m0 − m1)·t² + (m0 + m1 − 2Δ)·t³, Δ = y1 − y0 and the
 * slopes scaled to the interval (m = h·dy/dx).
 */
export function hermiteCoefficients(values: Float64Array, slopes: Float64Array, h: number, intervals: number, coef: Float64Array): void {
  for (let j = 0; j < intervals; j++) {
    const y0 = values[j] as number;
    const d = (values[j + 1] as number) - y0;
    const m0 = h * (slopes[j] as number);
    const m1 = h * (slopes[j + 1] as number);
    coef[4 * j] = y0;
    coef[4 * j + 1] = m0;
    coef[4 * j + 2] = 3 * d - 2 * m0 - m1;
    coef[4 * j + 3] = m0 + m1 - 2 * d;
  }
}

/** Each of `x` read from the coefficients of `hermiteCoefficients` (knots from `lo`, `h` apart) into `out`. */
export function interpolateKnots(x: Float64Array, lo: number, h: number, intervals: number, coef: Float64Array, out: Float64Array): void {
  const n = x.length;
  const scale = 1 / h;
  const top = intervals - 1;
  for (let i = 0; i < n; i++) {
    const u = ((x[i] as number) - lo) * scale;
    // u lies in [0, intervals] up to rounding: truncation is the floor there, and an integer index.
    let j = u | 0;
    if (j > top) j = top;
    else if (j < 0) j = 0;
    const t = u - j;
    const c = j << 2;
    out[i] = (coef[c] as number) + t * ((coef[c + 1] as number) + t * ((coef[c + 2] as number) + t * (coef[c + 3] as number)));
  }
}
