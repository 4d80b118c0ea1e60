import { extremes, moments, stateLevels } from './levels.js';
import type { ShapeClass } from './types.js';

/** Figures of one averaged period that tell shapes apart. */
export interface ShapeFeatures {
  /** Peak deviation from the mean over AC RMS: sine √2, triangle √3, square 1. */
  readonly crestFactor: number;
  /** AC RMS over mean absolute deviation: sine π/(2√2) ≈ 1.111, triangle 2/√3 ≈ 1.155, square 1. */
  readonly formFactor: number;
  /** Share of the period within 10 % of the amplitude of either state level (two-level signals near 1, ringing or not). */
  readonly nearExtremes: number;
  /** Share of the period within 1.5 % of the swing of the highest and of the lowest value. */
  readonly flatTop: number;
  readonly flatBottom: number;
  /** Mean time spent within 2 % of the swing of the mean at each crossing of it, fraction of the period. */
  readonly midDwell: number;
}

export function shapeFeatures(period: Float64Array): ShapeFeatures {
  const n = period.length;
  const { min, max } = extremes(period);
  const swing = max - min;
  const m = moments(period);
  const peakDev = Math.max(max - m.mean, m.mean - min);
  // State levels (histogram modes, IEEE Std 181-2011), not the extremes, so overshoot does not hide a square.
  const { low, high } = stateLevels(period, 0, n, 64);
  const band = 0.1 * (high - low);
  let near = 0;
  let top = 0;
  let bottom = 0;
  for (const v of period) {
    if (Math.abs(v - high) <= band || Math.abs(v - low) <= band) near++;
    if (v >= max - 0.015 * swing) top++;
    if (v <= min + 0.015 * swing) bottom++;
  }
  return {
    crestFactor: m.rmsAc > 0 ? peakDev / m.rmsAc : Number.NaN,
    formFactor: m.meanAbs > 0 ? m.rmsAc / m.meanAbs : Number.NaN,
    nearExtremes: near / n,
    flatTop: top / n,
    flatBottom: bottom / n,
    midDwell: midDwell(period, m.mean, 0.02 * swing),
  };
}

/** Mean length of the runs (circular) within ±band of the level that contain a crossing of it. */
function midDwell(period: Float64Array, level: number, band: number): number {
  const n = period.length;
  const inside = (i: number): boolean => Math.abs((period[((i % n) + n) % n] as number) - level) <= band;
  const runs: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = (period[i] as number) - level;
    const b = (period[(i + 1) % n] as number) - level;
    if (!((a < 0 && b >= 0) || (a >= 0 && b < 0))) continue;
    let lo = i;
    let hi = i + 1;
    while (inside(lo) && i - lo < n) lo--;
    while (inside(hi) && hi - i < n) hi++;
    runs.push(Math.max(0, hi - lo - 1));
  }
  if (runs.length === 0) return 0;
  return runs.reduce((s, r) => s + r, 0) / runs.length / n;
}

/** Thresholds, chosen between the closed-form values of each ideal shape (common practice, no source). */
const sqrt2 = Math.SQRT2;
const sqrt3 = Math.sqrt(3);

/**
 * Sort a period into a shape class from its features and harmonics
 * (amplitudes by harmonic number; `thd` as a fraction).
 */
export function classify(f: ShapeFeatures, amplitudes: Float64Array, thd: number): ShapeClass {
  if (f.nearExtremes >= 0.7) return 'square';
  const h1 = amplitudes[1] ?? 0;
  const h2 = amplitudes[2] ?? 0;
  const h3 = amplitudes[3] ?? 0;
  if (thd <= 0.1 && Math.abs(f.crestFactor - sqrt2) <= 0.15) return 'sine';
  // A triangle's odd harmonics fall as 1/k², so h3/h1 = 1/9 and there are no even ones.
  const ratio3 = h1 > 0 ? h3 / h1 : 0;
  if (thd > 0.07 && thd < 0.2 && Math.abs(f.crestFactor - sqrt3) <= 0.15 && Math.abs(ratio3 - 1 / 9) < 0.04 && h2 < 0.05 * h1) return 'triangle';
  return 'other';
}

/**
 * Flat tops: a smooth sine stays within 1.5 % of the swing of its peak for
 * acos(0.97)/π ≈ 7.8 % of the period; clipping holds it there longer.
 */
export function isClipped(f: ShapeFeatures, shape: ShapeClass): boolean {
  return shape !== 'square' && (f.flatTop > 0.12 || f.flatBottom > 0.12);
}

/**
 * A crossover notch: a sine passes within 2 % of the swing of its mean for
 * 2·asin(0.04)/(2π) ≈ 1.3 % of the period at each crossing, a triangle for
 * 2 %; an output that sits on a flat step there (a push-pull dead band) stays
 * much longer.
 */
export function hasNotch(f: ShapeFeatures, shape: ShapeClass): boolean {
  return shape !== 'square' && f.midDwell > 0.03;
}
