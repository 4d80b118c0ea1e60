import type { ComplexSlot, Response } from './harmonic-response.js';
import type { LinearNet } from './linear-net.js';
import { netResponse } from './filter-net.js';
import { findPeak, firstCrossing, nearestCrossing } from './response-search.js';
import type { OpampModel } from './types.js';

/** What a bench sweep of a second-order section reads (DESIGN §3 definitions). */
export interface FilterFigures {
  readonly response: Response;
  /** Low-/high-pass: the ∓90° phase point; band-pass: the peak of |H|, Hz. */
  readonly f0: number;
  /** |H(f0)| / gain (low-/high-pass), f0 / bw (band-pass). */
  readonly q: number;
  /** Where |H| falls to gain/√2 (low-/high-pass), Hz; NaN for the band-pass. */
  readonly fc: number;
  /** Passband gain (low-pass: at DC; high-pass: at 30·f0); band-pass: H(f0) with its sign. */
  readonly gain: number;
  /** Band-pass: between the −3 dB points, Hz; NaN otherwise. */
  readonly bw: number;
}

export type FilterShape = 'lowpass' | 'highpass' | 'bandpass';

/**
 * Read the figures off the numerically solved transfer function (op-amp GBW
 * and all), as a sweep on the bench would, starting near the ideal f0 `guess`:
 * the phase crossing and the −3 dB points by bracketing on a log grid and
 * regula falsi, the band-pass peak by golden section. A section that passes
 * nothing (a part open in the signal path) has NaN figures and gain 0.
 */
export function filterFigures(net: LinearNet, out: number, op: OpampModel, shape: FilterShape, guess: number, rtol: number): FilterFigures {
  const response = netResponse(net, out, op);
  const slot: ComplexSlot = { re: 0, im: 0 };
  const at = (f: number): ComplexSlot => {
    response(f, slot);
    return slot;
  };
  const mag = (f: number) => Math.hypot(at(f).re, slot.im);
  const realPart = (f: number) => at(f).re;
  const none = { response, f0: Number.NaN, q: Number.NaN, fc: Number.NaN, bw: Number.NaN };
  if (shape === 'bandpass') {
    // Coarse log grid for the peak, then golden section between the grid neighbours.
    // The peak sits within a factor 3 of the design f0 on any usable op-amp; look wider only if not.
    let best = 0;
    let bestF = guess;
    let isEdge = true;
    for (const span of [3, 100]) {
      best = 0;
      const first = guess / span;
      const last = guess * span;
      for (let f = first; f <= last; f *= 1.1) {
        const m = mag(f);
        if (m > best) {
          best = m;
          bestF = f;
          isEdge = f === first || f * 1.1 > last;
        }
      }
      if (!isEdge) break;
    }
    if (!(best > 1e-9)) return { ...none, gain: 0 };
    if (isEdge) {
      // No peak inside three decades around the design (a faulted section that became a
      // low- or high-pass): no centre to read; the gain is read at the design f0.
      const h = at(guess);
      return { ...none, gain: h.re < 0 ? -Math.hypot(h.re, h.im) : Math.hypot(h.re, h.im) };
    }
    const f0 = findPeak(mag, bestF / 1.1, bestF * 1.1, rtol);
    const h = at(f0);
    const peak = Math.hypot(h.re, h.im);
    const gain = h.re < 0 ? -peak : peak;
    const level = (f: number) => mag(f) - peak / Math.SQRT2;
    const lower = firstCrossing(level, f0, f0 / 1e4, 1.2, rtol);
    const upper = firstCrossing(level, f0, f0 * 1e4, 1.2, rtol);
    const bw = upper - lower;
    return { response, f0, q: f0 / bw, fc: Number.NaN, gain, bw };
  }
  if (shape === 'lowpass') {
    const gain = at(0).re;
    if (!(Math.abs(gain) > 1e-9)) return { ...none, gain };
    // One −90° crossing and one −3 dB point near the design f0 (the op-amp moves them by tens of % at most).
    const f0 = nearestCrossing(realPart, guess, 1.3, 1000, rtol);
    const q = mag(f0) / Math.abs(gain);
    const fc = nearestCrossing((f) => mag(f) - Math.abs(gain) / Math.SQRT2, Number.isFinite(f0) ? f0 : guess, 1.3, 1000, rtol);
    return { response, f0, q, fc, gain, bw: Number.NaN };
  }
  const f0 = nearestCrossing(realPart, guess, 1.3, 1000, rtol);
  const top = Number.isFinite(f0) ? 30 * f0 : 30 * guess;
  const gain = mag(top);
  if (!(gain > 1e-9)) return { ...none, gain };
  const q = mag(f0) / gain;
  const fc = nearestCrossing((f) => mag(f) - gain / Math.SQRT2, Number.isFinite(f0) ? f0 : guess, 1.3, 1000, rtol);
  return { response, f0, q, fc, gain, bw: Number.NaN };
}
