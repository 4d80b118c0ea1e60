import type { SchmittTiming } from './schmitt-model.js';
import type { Waveform } from './types.js';
import { defaultSamples } from './waveform.js';

/**
 * One period of the square and the triangle from the timing model, phase 0 at
 * the square's rising mid-level crossing (start of its high half). The square
 * is a trapezoid whose ramps last `edge` and are centred on the effective
 * switching instants; the triangle is its running integral, scaled and shifted
 * to the model's peaks (which carry the integrator's small − input offset that
 * the integral leaves out) and clipped at the integrator's swing.
 */
export function schmittWaves(
  t: SchmittTiming,
  swingHigh: number,
  swingLow: number,
  n = defaultSamples,
  buffer?: (slot: number, length: number) => Float64Array,
): { square: Waveform; triangle: Waveform } {
  // A trial's reused arrays (EvalInput.buffer); every sample is written below.
  const square = buffer ? buffer(0, n) : new Float64Array(n);
  const triangle = buffer ? buffer(1, n) : new Float64Array(n);
  const { period, squareHigh: sH, squareLow: sL } = t;
  const h = t.highTime;
  // A model stretched past its range must still draw: an edge never outlasts a half.
  const e = Math.min(t.edge, h, period - h);
  const mid = (sH + sL) / 2;
  const slope = e > 0 ? (sH - sL) / e : 0;
  // Segment ends: rising ramp's second half, high flat, falling ramp, low flat, rising ramp's first half.
  const ends0 = e / 2;
  const ends1 = h - e / 2;
  const ends2 = h + e / 2;
  const ends3 = period - e / 2;
  // The raw integral's extremes lie where the square crosses 0 on its ramps (closed form), so one
  // pass can scale and clip: max −S at the rising crossing, min at the falling one.
  const zeroArea = slope > 0 ? (mid * mid) / (2 * slope) : 0;
  const rawMax = zeroArea;
  const rawMin = -(mid * (e / 2) + sH * (h - e / 2)) - zeroArea;
  const raw = rawMax - rawMin;
  const scale = raw > 0 ? (t.triangleMax - t.triangleMin) / raw : 0;
  const offset = (t.triangleMax + t.triangleMin) / 2 - ((rawMax + rawMin) / 2) * scale;
  // Segment by segment (the same values as a switch per sample, without the switch): within
  // one, the square is mid + slope·dt, sH, sH − slope·dt, sL or sL + slope·dt, and the
  // triangle falls by its running area.
  let i = 0;
  let segArea = 0;
  let segStart = 0;
  for (let seg = 0; seg < 5; seg++) {
    const end = seg === 0 ? ends0 : seg === 1 ? ends1 : seg === 2 ? ends2 : seg === 3 ? ends3 : Infinity;
    const base = seg === 0 ? mid : seg === 1 || seg === 2 ? sH : sL;
    // Square: base + ramp·dt; area over dt: base·dt + ramp·dt²/2.
    const ramp = seg === 0 || seg === 4 ? slope : seg === 2 ? -slope : 0;
    for (; i < n; i++) {
      const time = (i / n) * period;
      if (time >= end) break;
      const dt = time - segStart;
      square[i] = ramp === 0 ? base : base + ramp * dt;
      // The integrator inverts: the triangle falls while the square is high.
      const v = offset - (segArea + (ramp === 0 ? base * dt : base * dt + (ramp * dt * dt) / 2)) * scale;
      // Math.min/max rather than a conditional that picks an argument: the optimiser then keeps v
      // a raw double instead of boxing one number per sample (measured: 4 kB of garbage per wave).
      triangle[i] = Math.min(swingHigh, Math.max(swingLow, v));
    }
    if (seg < 4) {
      segArea += areaOf(seg, end - segStart, mid, slope, sH, sL);
      segStart = end;
    }
  }
  const frequency = 1 / period;
  return { square: { frequency, samples: square }, triangle: { frequency, samples: triangle } };
}

/** ∫ of the square over the first `dt` of segment `seg` (the ramps are linear). */
function areaOf(seg: number, dt: number, mid: number, slope: number, sH: number, sL: number): number {
  switch (seg) {
    case 0:
      return mid * dt + (slope * dt * dt) / 2;
    case 1:
      return sH * dt;
    case 2:
      return sH * dt - (slope * dt * dt) / 2;
    case 3:
      return sL * dt;
    default:
      return sL * dt + (slope * dt * dt) / 2;
  }
}
