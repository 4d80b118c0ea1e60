import type { Waveform } from './types.js';

/** Samples per period for waveforms flowing down the chain (harmonics to 127 are exact). */
export const defaultSamples = 256;

/** A waveform from a function of phase (0 ≤ phase < 1). */
export function fromPhase(frequency: number, f: (phase: number) => number, n = defaultSamples): Waveform {
  const samples = new Float64Array(n);
  for (let i = 0; i < n; i++) samples[i] = f(i / n);
  return { frequency, samples };
}

/** A constant level (frequency 0). */
export function dc(level: number, n = 1): Waveform {
  return { frequency: 0, samples: new Float64Array(n).fill(level) };
}

/** Highest and lowest sample, in one pass (a stage's vpp and peak on the trial path). */
export function extremes(samples: Float64Array): { hi: number; lo: number } {
  let hi = -Infinity;
  let lo = Infinity;
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i] as number;
    if (v > hi) hi = v;
    if (v < lo) lo = v;
  }
  return { hi, lo };
}

export function vmax(w: Waveform): number {
  let m = -Infinity;
  for (const v of w.samples) if (v > m) m = v;
  return m;
}

export function vmin(w: Waveform): number {
  let m = Infinity;
  for (const v of w.samples) if (v < m) m = v;
  return m;
}

export function vpp(w: Waveform): number {
  return vmax(w) - vmin(w);
}

export function mean(w: Waveform): number {
  let s = 0;
  for (const v of w.samples) s += v;
  return s / w.samples.length;
}

const tableCache = new Map<number, { cos: Float64Array; sin: Float64Array }>();

function tables(n: number): { cos: Float64Array; sin: Float64Array } {
  let t = tableCache.get(n);
  if (!t) {
    const cos = new Float64Array(n);
    const sin = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      cos[i] = Math.cos((2 * Math.PI * i) / n);
      sin[i] = Math.sin((2 * Math.PI * i) / n);
    }
    t = { cos, sin };
    tableCache.set(n, t);
  }
  return t;
}

/** Amplitude of harmonic k of one period (direct DFT bin k, exact for a periodic record). */
export function harmonic(w: Waveform, k: number): number {
  const n = w.samples.length;
  const { cos, sin } = tables(n);
  let re = 0;
  let im = 0;
  for (let i = 0; i < n; i++) {
    const idx = (k * i) % n;
    const v = w.samples[i] ?? 0;
    re += v * (cos[idx] ?? 0);
    im += v * (sin[idx] ?? 0);
  }
  return (2 * Math.hypot(re, im)) / n;
}

/**
 * THD per DESIGN §4 (contract): root-sum-square of harmonics 2…50 (or as many as
 * lie below half the sample count) over the fundamental, as a fraction.
 */
export function thd(w: Waveform, highest = 50): number {
  const n = w.samples.length;
  const top = Math.min(highest, Math.floor((n - 1) / 2));
  const fundamental = harmonic(w, 1);
  if (fundamental === 0) return Number.NaN;
  let sum = 0;
  for (let k = 2; k <= top; k++) sum += harmonic(w, k) ** 2;
  return Math.sqrt(sum) / fundamental;
}
