import FFT from 'fft.js';
import type { Complex } from './types.js';

/**
 * The periodic steady state of a linear network driven by one period of a
 * waveform: every harmonic k (at k·frequency) multiplied by the transfer
 * function h(k·frequency), DC by h(0). Through one real FFT and its inverse
 * (fft.js) for power-of-two lengths, a direct DFT otherwise. Used where a stage's
 * response is not a plain single pole (a passive stage under a reactive load, a
 * generator's source impedance into a frequency-dependent input); the plain
 * single pole keeps its faster time-domain form (single-pole.ts).
 * Harmonics up to half the sample count are kept; the Nyquist bin takes the real
 * part of h only, so a real waveform stays real.
 */
export function applyResponse(
  samples: Float64Array,
  frequency: number,
  h: (f: number) => Complex,
  out: Float64Array = new Float64Array(samples.length),
): Float64Array {
  const n = samples.length;
  if (!(frequency > 0) || n < 2) {
    const g = h(0).re;
    for (let i = 0; i < n; i++) out[i] = g * (samples[i] as number);
    return out;
  }
  if ((n & (n - 1)) === 0 && n >= 4) return viaFft(samples, frequency, h, out);
  return viaDft(samples, frequency, h, out);
}

const plans = new Map<number, { fft: FFT; spectrum: number[]; back: number[] }>();

/** With this few harmonics (a sine has one), summing them directly beats the inverse transform. */
const sparse = 4;
const bins = new Int32Array(sparse);

/** out = Σ over the carried bins of the (already filtered) half spectrum, as a real signal. */
function synthesize(spectrum: number[], which: Int32Array, count: number, n: number, out: Float64Array): Float64Array {
  out.fill(0);
  for (let c = 0; c < count; c++) {
    const k = which[c] as number;
    const re = spectrum[2 * k] as number;
    const im = spectrum[2 * k + 1] as number;
    // Bins k and n − k together: (2/n)·(re·cos θ − im·sin θ); DC and Nyquist once (1/n).
    const w = k === 0 || 2 * k === n ? 1 / n : 2 / n;
    if (re === 0 && im === 0) continue;
    const step = (2 * Math.PI * k) / n;
    // A rotation per sample (cos, sin of kθ by recurrence) instead of n trigonometric calls.
    const cs = Math.cos(step);
    const sn = Math.sin(step);
    let c0 = 1;
    let s0 = 0;
    for (let i = 0; i < n; i++) {
      out[i] = (out[i] as number) + w * (re * c0 - im * s0);
      const c1 = c0 * cs - s0 * sn;
      s0 = s0 * cs + c0 * sn;
      c0 = c1;
    }
  }
  return out;
}

function viaFft(samples: Float64Array, frequency: number, h: (f: number) => Complex, out: Float64Array): Float64Array {
  const n = samples.length;
  let p = plans.get(n);
  if (!p) {
    const fft = new FFT(n);
    p = { fft, spectrum: fft.createComplexArray(), back: fft.createComplexArray() };
    plans.set(n, p);
  }
  const { fft, spectrum, back } = p;
  fft.realTransform(spectrum, samples);
  const half = n / 2;
  // Harmonics the input does not carry (a sine has one) need no transfer function:
  // below 1e-24 of the total power, a part in 10¹² of the amplitude, they stay as they are.
  let power = 0;
  for (let k = 0; k <= half; k++) power += (spectrum[2 * k] as number) ** 2 + (spectrum[2 * k + 1] as number) ** 2;
  const floor = power * 1e-24;
  let carried = 0;
  for (let k = 0; k <= half; k++) {
    const re = spectrum[2 * k] as number;
    const im = spectrum[2 * k + 1] as number;
    if (re * re + im * im <= floor) continue;
    if (++carried <= sparse) bins[carried - 1] = k;
    const g = h(k * frequency);
    if (k === 0 || k === half) {
      spectrum[2 * k] = re * g.re;
      spectrum[2 * k + 1] = 0;
    } else {
      spectrum[2 * k] = re * g.re - im * g.im;
      spectrum[2 * k + 1] = re * g.im + im * g.re;
    }
  }
  if (carried <= sparse) return synthesize(spectrum, bins, carried, n, out);
  // The mirror half of a real signal's spectrum: bin n−k is the conjugate of bin k.
  for (let k = 1; k < half; k++) {
    spectrum[2 * (n - k)] = spectrum[2 * k] as number;
    spectrum[2 * (n - k) + 1] = -(spectrum[2 * k + 1] as number);
  }
  fft.inverseTransform(back, spectrum);
  for (let i = 0; i < n; i++) out[i] = back[2 * i] as number;
  return out;
}

function viaDft(samples: Float64Array, frequency: number, h: (f: number) => Complex, out: Float64Array): Float64Array {
  const n = samples.length;
  const half = Math.floor(n / 2);
  out.fill(0);
  for (let k = 0; k <= half; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      re += (samples[i] as number) * Math.cos(a);
      im -= (samples[i] as number) * Math.sin(a);
    }
    const g = h(k * frequency);
    const yr = re * g.re - im * g.im;
    const yi = re * g.im + im * g.re;
    // Both halves of the spectrum at once: 2·Re(Y·e^{jθ})/n, except DC and Nyquist once.
    const w = k === 0 || (n % 2 === 0 && k === half) ? 1 / n : 2 / n;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      out[i] = (out[i] as number) + w * (yr * Math.cos(a) - yi * Math.sin(a));
    }
  }
  return out;
}
