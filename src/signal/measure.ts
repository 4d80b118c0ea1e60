import { crossings, periodFromCrossings } from './crossings.js';
import { harmonicAnalysis, refineFrequency } from './harmonics.js';
import { moments, momentsAbout, stateLevels } from './levels.js';
import { averagePeriod } from './period-average.js';
import { classify, hasNotch, isClipped, shapeFeatures } from './shape.js';
import { transitions } from './transitions.js';
import { CaptureError, type Measurements } from './types.js';

/** Fewest samples worth measuring. */
const minSamples = 16;
/** Longest segment the frequency refinement and the harmonics look at, samples. */
const maxSpectrumSamples = 1 << 18;
const maxHarmonicSamples = 1 << 17;

const pass = new Float64Array(3);

/**
 * Min, max and sum of x into `pass`; the index of the first sample that is not
 * a finite number, or −1. A small function of its own: a one-shot `analyze`
 * compiles it while the loop runs, and a small one compiles sooner than
 * `measure` whole (seen with --trace-osr).
 */
function firstPass(x: Float64Array): number {
  let min = Infinity;
  let max = -Infinity;
  let sum = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i] as number;
    if (!Number.isFinite(v)) return i;
    if (v < min) min = v;
    if (v > max) max = v;
    sum += v;
  }
  pass[0] = min;
  pass[1] = max;
  pass[2] = sum;
  return -1;
}

/** The measured figures plus one averaged period, for the trace. */
export interface MeasureResult {
  readonly measurements: Measurements;
  /** One period averaged over the whole periods (empty when there are none). */
  readonly period: Float64Array;
}

/**
 * Measure a uniformly sampled capture: levels, RMS over whole periods,
 * frequency (mean-level crossings refined by the spectrum), THD, shape, and
 * for a square the duty cycle and edges. Throws `CaptureError` when the capture
 * is too short or holds values that are not numbers.
 */
export function measure(x: Float64Array, sampleRate: number): MeasureResult {
  const n = x.length;
  if (n < minSamples) throw new CaptureError(`only ${n} samples; at least ${minSamples} are needed to measure anything`);
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new CaptureError(`sample rate ${sampleRate} Hz is not usable`);
  // One pass for the check, the extremes and the sum (each as `extremes` and
  // `moments` form them); the pass about the whole record's mean only when the
  // figures are taken over the whole record (no periods found): a periodic
  // capture's figures come from its whole periods.
  const bad = firstPass(x);
  if (bad >= 0) throw new CaptureError(`sample ${bad + 1} is ${x[bad]}; the capture must hold numbers only`);
  const min = pass[0] as number;
  const max = pass[1] as number;
  const sum = pass[2] as number;
  const vpp = max - min;
  const mean0 = sum / n;
  const warnings: string[] = [];
  const none = {
    samples: n,
    sampleRate,
    min,
    max,
    vpp,
    duty: null,
    rise: null,
    fall: null,
    overshoot: null,
    notchTime: null,
  };
  const aperiodic = (reason: string): MeasureResult => {
    const whole = momentsAbout(x, 0, n, mean0);
    return {
      measurements: {
        ...none,
        frequency: null,
        mean: whole.mean,
        vrms: whole.rms,
        vrmsAc: whole.rmsAc,
        thd: null,
        shape: 'other',
        clipped: false,
        notch: false,
        crestFactor: whole.rmsAc > 0 ? Math.max(max - whole.mean, whole.mean - min) / whole.rmsAc : Number.NaN,
        formFactor: whole.meanAbs > 0 ? whole.rmsAc / whole.meanAbs : Number.NaN,
        periods: 0,
        window: 'none',
        warnings: [...warnings, reason],
      },
      period: new Float64Array(0),
    };
  };
  if (!(vpp > 0)) return aperiodic('the capture is flat (a DC level): no frequency, THD or shape; figures over the whole record');

  // Mean-level crossings with hysteresis of 30 % of the way to each extreme,
  // so noise on a slow crossing does not add crossings, and a square of small
  // duty (mean near one level) still arms.
  const found = crossings(x, mean0, mean0 - 0.3 * (mean0 - min), mean0 + 0.3 * (max - mean0));
  const rising = found.rising;
  if (rising.length < 3) {
    return aperiodic(
      `fewer than 2 whole periods (${Math.max(0, rising.length - 1)} found): frequency, THD and shape need at least 2; figures over the whole record`,
    );
  }
  const rough = periodFromCrossings(rising);
  // At least 8 periods where the capture has them, however slow the signal.
  const spectrumLength = Math.min(n, Math.max(maxSpectrumSamples, Math.ceil(8 * rough)));
  const nu = refineFrequency(x, 0, spectrumLength, 1 / rough, mean0);
  let period = 1 / nu;
  if (!(Math.abs(period - rough) < 0.05 * rough)) {
    warnings.push('the spectrum and the crossings disagree on the frequency; using the crossings');
    period = rough;
  }
  const start = rising[0] as number;
  const periods = Math.floor((n - 1 - start) / period);
  if (periods < 2) return aperiodic('fewer than 2 whole periods after the first crossing; figures over the whole record');
  const from = Math.ceil(start);
  const to = Math.min(n, Math.round(start + periods * period));
  const m = moments(x, from, to);

  const harmonicPeriods = Math.max(2, Math.min(periods, Math.floor(maxHarmonicSamples / period)));
  const h = harmonicAnalysis(x, from, period, harmonicPeriods, m.mean);
  const points = Math.max(256, Math.min(1024, Math.round(period)));
  const averaged = averagePeriod(x, start, period, Math.min(periods, Math.max(1, Math.floor((1 << 20) / points))), points);
  const features = shapeFeatures(averaged);
  const shape = classify(features, h.amplitudes, h.thd);
  const clipped = isClipped(features, shape);
  const notch = hasNotch(features, shape);
  if (period < 10) warnings.push(`only ${period.toFixed(1)} samples per period: harmonics above ${h.highest} are beyond half the sample rate`);

  let duty: number | null = null;
  let rise: number | null = null;
  let fall: number | null = null;
  let overshoot: number | null = null;
  if (shape === 'square') {
    const { low, high } = stateLevels(x, from, to);
    const mid = (low + high) / 2;
    const edges = crossings(x, mid, mid - 0.2 * (high - low), mid + 0.2 * (high - low), from, to);
    duty = dutyCycle(edges.rising, edges.falling, period);
    const t = transitions(x, edges.rising, edges.falling, low, high, period);
    rise = Number.isFinite(t.rise) ? t.rise / sampleRate : null;
    fall = Number.isFinite(t.fall) ? t.fall / sampleRate : null;
    overshoot = Number.isFinite(t.overshoot) ? t.overshoot : null;
    if ((rise !== null && t.rise < 3) || (fall !== null && t.fall < 3)) {
      warnings.push('edges span fewer than 3 samples: rise and fall times are limited by the sample rate');
    }
  }
  return {
    measurements: {
      ...none,
      frequency: sampleRate / period,
      mean: m.mean,
      vrms: m.rms,
      vrmsAc: m.rmsAc,
      duty,
      rise,
      fall,
      overshoot,
      thd: Number.isFinite(h.thd) ? h.thd : null,
      shape,
      clipped,
      notch,
      notchTime: notch ? (features.midDwell * period) / sampleRate : null,
      crestFactor: features.crestFactor,
      formFactor: features.formFactor,
      periods,
      window: `Hann over ${harmonicPeriods} whole periods, harmonics 2–${h.highest} at exact multiples of the fundamental`,
      warnings: [...warnings],
    },
    period: averaged,
  };
}

/** Mean share of each period from a rising crossing to the next falling one. */
function dutyCycle(rising: Float64Array, falling: Float64Array, period: number): number | null {
  let sum = 0;
  let count = 0;
  let j = 0;
  for (const r of rising) {
    while (j < falling.length && (falling[j] as number) <= r) j++;
    const f = falling[j];
    if (f === undefined) break;
    if (f - r < period) {
      sum += (f - r) / period;
      count++;
    }
  }
  return count > 0 ? sum / count : null;
}
