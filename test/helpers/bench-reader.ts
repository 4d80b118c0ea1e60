/**
 * A technician's readings off a simulated waveform, written here independently
 * of `src/signal`: the last part of a transient (the start-up skipped), the
 * frequency from the mean spacing of rising crossings of the mid level (IEEE
 * 181 50 % reference), duty as the time above it over whole periods, Vpp from
 * the extremes, the two state levels as the medians above and below the mid
 * level, and THD as the root-sum-square of harmonics 2–50 over the fundamental
 * (DESIGN §4) from a Fourier integral over whole periods (trapezoid rule on the
 * simulator's own time steps).
 */
export interface WaveReading {
  readonly periodic: boolean;
  readonly frequency: number;
  readonly vpp: number;
  readonly max: number;
  readonly min: number;
  readonly mean: number;
  readonly duty: number;
  readonly high: number;
  readonly low: number;
  readonly thd: number;
}

function median(values: number[]): number {
  if (values.length === 0) return Number.NaN;
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
}

export function readWave(t: Float64Array, v: Float64Array, from: number): WaveReading {
  const ts: number[] = [];
  const vs: number[] = [];
  for (let i = 0; i < t.length; i++) {
    if ((t[i] as number) >= from) {
      ts.push(t[i] as number);
      vs.push(v[i] as number);
    }
  }
  let max = -Infinity;
  let min = Infinity;
  for (const x of vs) {
    max = Math.max(max, x);
    min = Math.min(min, x);
  }
  const mid = (max + min) / 2;
  const rising: number[] = [];
  for (let i = 1; i < ts.length; i++) {
    const a = (vs[i - 1] as number) - mid;
    const b = (vs[i] as number) - mid;
    if (a < 0 && b >= 0) rising.push((ts[i - 1] as number) + ((ts[i] as number) - (ts[i - 1] as number)) * (a / (a - b)));
  }
  const flatMean = vs.reduce((s, x) => s + x, 0) / Math.max(1, vs.length);
  if (max - min < 2e-3 || rising.length < 3) {
    return { periodic: false, frequency: 0, vpp: max - min, max, min, mean: flatMean, duty: Number.NaN, high: flatMean, low: flatMean, thd: Number.NaN };
  }
  const t0 = rising[0] as number;
  const t1 = rising[rising.length - 1] as number;
  const periods = rising.length - 1;
  const f = periods / (t1 - t0);
  // Integrals over whole periods by the trapezoid rule on the simulator's steps.
  let above = 0;
  let area = 0;
  const k = 50;
  const re = new Float64Array(k + 1);
  const im = new Float64Array(k + 1);
  let wMax = -Infinity;
  let wMin = Infinity;
  const hi: number[] = [];
  const lo: number[] = [];
  for (let i = 1; i < ts.length; i++) {
    const ta = ts[i - 1] as number;
    const tb = ts[i] as number;
    if (tb <= t0 || ta >= t1) continue;
    const a = Math.max(ta, t0);
    const b = Math.min(tb, t1);
    const lerp = (x: number) => (vs[i - 1] as number) + ((vs[i] as number) - (vs[i - 1] as number)) * ((x - ta) / (tb - ta));
    const va = lerp(a);
    const vb = lerp(b);
    const dt = b - a;
    area += ((va + vb) / 2) * dt;
    if ((va + vb) / 2 > mid) above += dt;
    wMax = Math.max(wMax, va, vb);
    wMin = Math.min(wMin, va, vb);
    (vb > mid ? hi : lo).push(vb);
    for (let h = 1; h <= k; h++) {
      const w = 2 * Math.PI * f * h;
      re[h] = (re[h] as number) + ((va * Math.cos(w * a) + vb * Math.cos(w * b)) / 2) * dt;
      im[h] = (im[h] as number) + ((va * Math.sin(w * a) + vb * Math.sin(w * b)) / 2) * dt;
    }
  }
  const span = t1 - t0;
  const amp = (h: number) => Math.hypot(re[h] as number, im[h] as number);
  let harmonics = 0;
  for (let h = 2; h <= k; h++) harmonics += amp(h) ** 2;
  return {
    periodic: true,
    frequency: f,
    vpp: wMax - wMin,
    max: wMax,
    min: wMin,
    mean: area / span,
    duty: above / span,
    high: median(hi),
    low: median(lo),
    thd: Math.sqrt(harmonics) / amp(1),
  };
}

/** Round to the digits a bench display shows (four significant). */
export function display(x: number): number {
  if (x === 0 || !Number.isFinite(x)) return x;
  return Number(x.toPrecision(4));
}
