import FFT from 'fft.js';
import type { Complex } from './types.js';

/**
 * The periodic steady state of a linear network with response H(f), driven by
 * one period of a waveform: every harmonic k of the input (frequency k·f) is
 * multiplied by H(k·f), the DC level by `dcGain`. One real FFT and one
 * inverse (fft.js, radix-4) for power-of-two lengths, a direct DFT otherwise.
 * Writes into `out` (same length as `samples`).
 */
export function harmonicResponse(samples: Float64Array, frequency: number, h: (f: number) => Complex, dcGain: number, out: Float64Array): void {
  const n = samples.length;
  if (n < 4 || (n & (n - 1)) !== 0) {
    direct(samples, frequency, h, dcGain, out);
    return;
  }
  const t = transformFor(n);
  t.fft.realTransform(t.spectrum, samples);
  t.fft.completeSpectrum(t.spectrum);
  const s = t.spectrum;
  s[0] = (s[0] as number) * dcGain;
  s[1] = 0;
  for (let k = 1; k <= n / 2; k++) {
    const g = h(k * frequency);
    const re = s[2 * k] as number;
    const im = s[2 * k + 1] as number;
    const yr = re * g.re - im * g.im;
    const yi = re * g.im + im * g.re;
    s[2 * k] = yr;
    s[2 * k + 1] = yi;
    if (k < n / 2) {
      // The negative frequency holds the conjugate, so the result stays real.
      s[2 * (n - k)] = yr;
      s[2 * (n - k) + 1] = -yi;
    } else s[2 * k + 1] = 0;
  }
  t.fft.inverseTransform(t.result, s);
  for (let i = 0; i < n; i++) out[i] = t.result[2 * i] as number;
}

function direct(samples: Float64Array, frequency: number, h: (f: number) => Complex, dcGain: number, out: Float64Array): void {
  const n = samples.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += samples[i] as number;
  mean /= n;
  out.fill(mean * dcGain);
  for (let k = 1; k <= Math.floor(n / 2); k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const w = (2 * Math.PI * k * i) / n;
      re += (samples[i] as number) * Math.cos(w);
      im -= (samples[i] as number) * Math.sin(w);
    }
    // Bin k and its mirror: amplitude 2/n, except at exactly n/2.
    const scale = 2 * k === n ? 1 / n : 2 / n;
    const g = h(k * frequency);
    const yr = (re * g.re - im * g.im) * scale;
    const yi = (re * g.im + im * g.re) * scale;
    for (let i = 0; i < n; i++) {
      const w = (2 * Math.PI * k * i) / n;
      out[i] = (out[i] as number) + yr * Math.cos(w) - yi * Math.sin(w);
    }
  }
}

const transforms = new Map<number, { fft: FFT; spectrum: number[]; result: number[] }>();

function transformFor(n: number): { fft: FFT; spectrum: number[]; result: number[] } {
  let t = transforms.get(n);
  if (!t) {
    const fft = new FFT(n);
    t = { fft, spectrum: fft.createComplexArray(), result: fft.createComplexArray() };
    transforms.set(n, t);
  }
  return t;
}
