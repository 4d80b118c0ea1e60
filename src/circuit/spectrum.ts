import FFT from 'fft.js';
import { thd } from './waveform.js';

/**
 * THD exactly as `thd()` in waveform.ts defines it (DESIGN §4 contract: RSS of
 * harmonics 2…50 over the fundamental, a fraction), but through one real FFT
 * (fft.js, radix-4) instead of a direct DFT per harmonic: the shaper's THD is
 * computed in every Monte Carlo trial. Lengths that are not a power of two go the
 * direct way.
 */
export function fastThd(samples: Float64Array, highest = 50): number {
  const n = samples.length;
  if (n < 4 || (n & (n - 1)) !== 0) return thd({ frequency: 1, samples }, highest);
  const { fft, out } = transformFor(n);
  fft.realTransform(out, samples);
  const top = Math.min(highest, Math.floor((n - 1) / 2));
  const re1 = out[2] ?? 0;
  const im1 = out[3] ?? 0;
  const fundamental = re1 * re1 + im1 * im1;
  if (fundamental === 0) return Number.NaN;
  let sum = 0;
  for (let k = 2; k <= top; k++) {
    const re = out[2 * k] ?? 0;
    const im = out[2 * k + 1] ?? 0;
    sum += re * re + im * im;
  }
  return Math.sqrt(sum / fundamental);
}

const transforms = new Map<number, { fft: FFT; out: number[] }>();

function transformFor(n: number): { fft: FFT; out: number[] } {
  let t = transforms.get(n);
  if (!t) {
    const fft = new FFT(n);
    t = { fft, out: fft.createComplexArray() };
    transforms.set(n, t);
  }
  return t;
}
