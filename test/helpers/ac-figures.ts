import type { SpiceTable } from './ngspice.js';

/**
 * The figures of a second-order section read off an ngspice AC sweep the way
 * DESIGN §3 defines them, with no code from src/: f0 at the ∓90° phase point
 * (the real part of V(out) changes sign), the passband gain (low-pass: the
 * lowest swept frequency; high-pass: at 30·f0), Q = |H(f0)|/gain, fc where |H|
 * falls to gain/√2; the band-pass at the peak of |H|, its −3 dB points and the
 * signed gain there. Between sweep points everything is interpolated linearly
 * on a log-frequency axis (the sweeps use 1000 points a decade).
 */
export interface SpiceFigures {
  readonly f0: number;
  readonly q: number;
  readonly fc: number;
  readonly gain: number;
  readonly bw: number;
}

function cross(f: Float64Array, y: (i: number) => number, from: number, step: 1 | -1): number {
  for (let i = from; i + step >= 0 && i + step < f.length; i += step) {
    const a = y(i);
    const b = y(i + step);
    if ((a <= 0 && b > 0) || (a >= 0 && b < 0)) {
      const w = a / (a - b);
      return Math.exp(Math.log(f[i] as number) * (1 - w) + Math.log(f[i + step] as number) * w);
    }
  }
  return Number.NaN;
}

/** |H| at frequency x, log-interpolated. */
function magAt(f: Float64Array, m: Float64Array, x: number): number {
  for (let i = 1; i < f.length; i++) {
    if ((f[i] as number) >= x) {
      const w = (Math.log(x) - Math.log(f[i - 1] as number)) / (Math.log(f[i] as number) - Math.log(f[i - 1] as number));
      return (m[i - 1] as number) * (1 - w) + (m[i] as number) * w;
    }
  }
  return Number.NaN;
}

export function spiceFigures(t: SpiceTable, shape: 'lowpass' | 'highpass' | 'bandpass', node = 'out'): SpiceFigures {
  const f = t['frequency'] as Float64Array;
  const re = t[`vr(${node})`] as Float64Array;
  const im = t[`vi(${node})`] as Float64Array;
  const m = Float64Array.from(re, (r, i) => Math.hypot(r, im[i] as number));
  if (shape === 'bandpass') {
    let k = 0;
    for (let i = 1; i < m.length; i++) if ((m[i] as number) > (m[k] as number)) k = i;
    // Parabola through the three points around the peak (log f axis) for the peak frequency.
    const x0 = Math.log(f[k - 1] as number);
    const x1 = Math.log(f[k] as number);
    const x2 = Math.log(f[k + 1] as number);
    const y0 = m[k - 1] as number;
    const y1 = m[k] as number;
    const y2 = m[k + 1] as number;
    const d = (x1 - x0) * (y1 - y2) - (x1 - x2) * (y1 - y0);
    const xp = x1 - (0.5 * ((x1 - x0) ** 2 * (y1 - y2) - (x1 - x2) ** 2 * (y1 - y0))) / d;
    const f0 = Math.exp(xp);
    const peak = magAt(f, m, f0);
    const level = (i: number) => (m[i] as number) - peak / Math.SQRT2;
    const lower = cross(f, level, k, -1);
    const upper = cross(f, level, k, 1);
    const bw = upper - lower;
    const sign = (re[k] as number) < 0 ? -1 : 1;
    return { f0, q: f0 / bw, fc: Number.NaN, gain: sign * peak, bw };
  }
  const f0 = cross(f, (i) => re[i] as number, 0, 1);
  const gain = shape === 'lowpass' ? (m[0] as number) : magAt(f, m, 30 * f0);
  const q = magAt(f, m, f0) / gain;
  let fc: number;
  if (shape === 'lowpass') fc = cross(f, (i) => (m[i] as number) - gain / Math.SQRT2, 0, 1);
  else {
    let top = 0;
    while ((f[top] as number) < 30 * f0) top++;
    fc = cross(f, (i) => (m[i] as number) - gain / Math.SQRT2, top, -1);
  }
  return { f0, q, fc, gain, bw: Number.NaN };
}
