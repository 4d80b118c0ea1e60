import FFT from 'fft.js';

/** A complex value a response writes into, reused instead of allocated. */
export interface ComplexSlot {
  re: number;
  im: number;
}

/** A linear network's transfer function: writes H(j·2πf) into `out`. */
export type Response = (f: number, out: ComplexSlot) => void;

const transforms = new Map<number, { fft: FFT; spectrum: number[]; back: number[] }>();

function transformFor(n: number): { fft: FFT; spectrum: number[]; back: number[] } {
  let t = transforms.get(n);
  if (!t) {
    const fft = new FFT(n);
    t = { fft, spectrum: fft.createComplexArray(), back: fft.createComplexArray() };
    transforms.set(n, t);
  }
  return t;
}

/**
 * The periodic steady state of a linear network driven by one period of a
 * waveform: every harmonic k of the input (one real FFT, fft.js) multiplied by
 * H(k·f), then back to samples. A harmonic below 1e-9 of the largest one is
 * dropped without solving the network, so a sine costs one solve and a
 * triangle its odd harmonics only. A DC input (frequency 0) is scaled by H(0).
 * Lengths that are not a power of two take a direct DFT (O(n²), rare: the
 * chain's waveforms have 256 samples).
 */
export function applyResponse(samples: Float64Array, frequency: number, h: Response, target: Float64Array): Float64Array {
  const n = samples.length;
  const slot: ComplexSlot = { re: 0, im: 0 };
  if (!(frequency > 0) || n < 2) {
    h(0, slot);
    for (let i = 0; i < n; i++) target[i] = (samples[i] as number) * slot.re;
    return target;
  }
  if ((n & (n - 1)) !== 0 || n < 4) return directResponse(samples, frequency, h, target);
  const { fft, spectrum, back } = transformFor(n);
  fft.realTransform(spectrum, samples);
  const half = n / 2;
  let largest = 0;
  for (let k = 0; k <= half; k++) largest = Math.max(largest, Math.hypot(spectrum[2 * k] as number, spectrum[2 * k + 1] as number));
  const floor = largest * 1e-9;
  for (let k = 0; k <= half; k++) {
    const xr = spectrum[2 * k] as number;
    const xi = spectrum[2 * k + 1] as number;
    let yr = 0;
    let yi = 0;
    if (Math.hypot(xr, xi) > floor) {
      h(k * frequency, slot);
      yr = xr * slot.re - xi * slot.im;
      yi = xr * slot.im + xi * slot.re;
    }
    // The Nyquist bin of a real signal is real: keep the real part of the product.
    if (k === half) yi = 0;
    spectrum[2 * k] = yr;
    spectrum[2 * k + 1] = yi;
    if (k > 0 && k < half) {
      spectrum[2 * (n - k)] = yr;
      spectrum[2 * (n - k) + 1] = -yi;
    }
  }
  fft.inverseTransform(back, spectrum);
  for (let i = 0; i < n; i++) target[i] = back[2 * i] as number;
  return target;
}

function directResponse(samples: Float64Array, frequency: number, h: Response, target: Float64Array): Float64Array {
  const n = samples.length;
  const slot: ComplexSlot = { re: 0, im: 0 };
  target.fill(0);
  for (let k = 0; k <= Math.floor(n / 2); k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      re += (samples[i] as number) * Math.cos(a);
      im -= (samples[i] as number) * Math.sin(a);
    }
    const weight = k === 0 || 2 * k === n ? 1 / n : 2 / n;
    h(k * frequency, slot);
    const yr = re * slot.re - im * slot.im;
    const yi = re * slot.im + im * slot.re;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      target[i] = (target[i] as number) + weight * (yr * Math.cos(a) - yi * Math.sin(a));
    }
  }
  return target;
}
