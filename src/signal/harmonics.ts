/**
 * The spectrum at chosen frequencies, taken directly (no FFT) over a whole
 * number of periods with a Hann window.
 *
 * Why this window: a capture's period is almost never a whole number of
 * samples, so an FFT bin never sits on a harmonic and a rectangular window
 * leaks. Evaluating the windowed transform at exactly k·f over P ≥ 2 whole
 * periods puts every other harmonic on a zero of the Hann window's transform
 * (its zeros lie at multiples of 1/(P·T) beyond the main lobe), so leakage
 * between harmonics is negligible, and a long capture costs one pass per
 * harmonic over a bounded segment rather than an FFT padded to 2^23 points.
 * Hann window: F. J. Harris, Proc. IEEE 66(1), 1978 (from memory).
 */

/**
 * Amplitude and phase of the component at `nu` cycles per sample in the
 * segment x[from … from + length), mean `dc` removed, under a Hann window
 * (computed as it goes, so a long segment allocates nothing). Amplitude is
 * the sine's peak (2·|X| / Σw).
 */
export function componentAt(x: Float64Array, from: number, length: number, nu: number, dc = 0): { amplitude: number; phase: number } {
  const step = -2 * Math.PI * nu;
  const cr = Math.cos(step);
  const sr = Math.sin(step);
  const wstep = (2 * Math.PI) / length;
  const wr = Math.cos(wstep);
  const wi = Math.sin(wstep);
  let re = 0;
  let im = 0;
  let sum = 0;
  let n = 0;
  // Rotating phasors for the signal frequency and the window, reset from
  // cos/sin every block so rounding cannot drift.
  while (n < length) {
    const end = Math.min(length, n + 4096);
    let c = Math.cos(step * n);
    let s = Math.sin(step * n);
    let wc = Math.cos(wstep * n);
    let ws = Math.sin(wstep * n);
    for (; n < end; n++) {
      const w = 0.5 - 0.5 * wc;
      const v = ((x[from + n] as number) - dc) * w;
      sum += w;
      re += v * c;
      im += v * s;
      const c2 = c * cr - s * sr;
      s = c * sr + s * cr;
      c = c2;
      const w2 = wc * wr - ws * wi;
      ws = wc * wi + ws * wr;
      wc = w2;
    }
  }
  return { amplitude: (2 * Math.hypot(re, im)) / sum, phase: Math.atan2(im, re) };
}

/**
 * Refine a frequency estimate (cycles per sample) to the peak of the
 * Hann-windowed spectrum of x[from, from + length): successive parabolic
 * interpolation on the log magnitude, within about one bin of the estimate.
 */
export function refineFrequency(x: Float64Array, from: number, length: number, nu0: number, dc: number): number {
  const mag = (nu: number): number => Math.log(componentAt(x, from, length, nu, dc).amplitude + 1e-300);
  const bin = 1 / length;
  let centre = nu0;
  let mc = mag(centre);
  for (const h of [0.5 * bin, 0.12 * bin, 0.03 * bin]) {
    let ml = mag(centre - h);
    let mr = mag(centre + h);
    // Walk uphill until the centre is the highest of the three (a few steps at most).
    for (let moves = 0; moves < 4 && (ml > mc || mr > mc); moves++) {
      if (ml > mr) {
        mr = mc;
        mc = ml;
        centre -= h;
        ml = mag(centre - h);
      } else {
        ml = mc;
        mc = mr;
        centre += h;
        mr = mag(centre + h);
      }
    }
    const den = ml - 2 * mc + mr;
    if (den < 0) {
      const offset = Math.max(-1, Math.min(1, (0.5 * (ml - mr)) / den));
      centre += offset * h;
      mc = mag(centre);
    }
  }
  return centre;
}

export interface HarmonicAnalysis {
  /** Peak amplitude of harmonic k at index k (index 0 unused), V. */
  readonly amplitudes: Float64Array;
  /** Highest harmonic taken (≤ 50, below half the sample rate). */
  readonly highest: number;
  /** RSS of harmonics 2…highest over the fundamental (DESIGN §4). */
  readonly thd: number;
}

/**
 * Harmonics 1…50 (or as many as lie below half the sample rate) of a signal
 * with period `period` samples, over `periods` whole periods from `from`.
 */
export function harmonicAnalysis(x: Float64Array, from: number, period: number, periods: number, dc: number, highest = 50): HarmonicAnalysis {
  const length = Math.round(period * periods);
  // k·f below fs/2 means k < period / 2.
  const top = Math.max(1, Math.min(highest, Math.ceil(period / 2) - 1));
  const amplitudes = new Float64Array(top + 1);
  // Evaluate at the harmonic itself; every other harmonic then lies P bins
  // (or more) away, where the Hann transform has fallen to nearly nothing.
  const nu = 1 / period;
  for (let k = 1; k <= top; k++) amplitudes[k] = componentAt(x, from, length, k * nu, dc).amplitude;
  let sum = 0;
  for (let k = 2; k <= top; k++) sum += (amplitudes[k] as number) ** 2;
  const fundamental = amplitudes[1] as number;
  return { amplitudes, highest: top, thd: fundamental > 0 ? Math.sqrt(sum) / fundamental : Number.NaN };
}
