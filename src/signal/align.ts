/**
 * Line a captured period up with the expected one for drawing: resample the
 * captured period to the expected period's length, then rotate it to the lag
 * that maximises the circular cross-correlation (means removed), so a capture
 * that starts at an arbitrary phase lies over the expected trace. Returns
 * `periods` repeats. Direct O(n²) correlation: n is a trace width (≤ a few
 * hundred), far below where an FFT would pay.
 */
export function alignPeriod(expected: Float64Array, captured: Float64Array, periods = 2): Float64Array {
  const n = expected.length;
  const m = captured.length;
  if (n < 2 || m < 2) return new Float64Array(0);
  const resampled = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // Linear interpolation on the circular period.
    const x = (i * m) / n;
    const j = Math.floor(x);
    const w = x - j;
    resampled[i] = (captured[j % m] ?? 0) * (1 - w) + (captured[(j + 1) % m] ?? 0) * w;
  }
  const meanOf = (a: Float64Array) => a.reduce((s, v) => s + v, 0) / a.length;
  const me = meanOf(expected);
  const mc = meanOf(resampled);
  let bestLag = 0;
  let best = -Infinity;
  for (let lag = 0; lag < n; lag++) {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += ((expected[i] ?? 0) - me) * ((resampled[(i + lag) % n] ?? 0) - mc);
    if (sum > best) {
      best = sum;
      bestLag = lag;
    }
  }
  const out = new Float64Array(n * periods);
  for (let i = 0; i < out.length; i++) out[i] = resampled[(i + bestLag) % n] ?? 0;
  return out;
}
