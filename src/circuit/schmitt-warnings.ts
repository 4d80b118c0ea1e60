import { formatValue } from '../units/format.js';
import type { SchmittCircuit, SchmittTiming } from './schmitt-model.js';
import type { StageWarning } from './types.js';

/**
 * Where the closed form of `schmitt-model.ts` stops being a firm target. The
 * limits come from the ngspice comparison in test/circuit/schmitt-integrator-spice.test.ts
 * (0.5 V/µs, 1 MHz op-amps):
 * - the model stays within 0.1 % unclamped and 0.1–0.4 % clamped (soft
 *   zeners; 0.1 % with an ideal clamp) while the comparator's full swing takes
 *   up to half of each half period; at 58–67 % it is 0.1–0.6 % off, at 81 %
 *   0.5 % (clamped), and once the triangle's overshoot reaches the
 *   integrator's swing it clips and the frequency is 10–16 % off. So: a note
 *   from 25 % (the frequency then hangs on the op-amp's slew rate, which
 *   spreads widely between parts — common practice, no source), and
 *   "unreliable" from 60 %, where a few % of slew-rate spread already moves
 *   the frequency by more than the parts do;
 * - when the overdrive build-up t1 = Vov/α exceeds 5 % of the period (a
 *   triangle small against the op-amp's overdrive) it was 0.4 % off at 8 % and
 *   2–3 % at 20–25 %;
 * - a triangle reaching the integrator's swing clips (the model then only
 *   knows the clipped level);
 * - above about a tenth of the gain-bandwidth a general-purpose op-amp gives
 *   out as a switch and as an integrator (common practice, no source).
 */
export const slewShareNote = 0.25;
export const slewShareUnreliable = 0.6;
export const overdriveShareLimit = 0.05;

const none: readonly StageWarning[] = [];

function v(x: number): string {
  return formatValue(x, 'V', { digits: 3 });
}

export function schmittWarnings(p: SchmittCircuit, t: SchmittTiming, opts: { readonly hasClamp: boolean; readonly hasRz: boolean }): readonly StageWarning[] {
  let out: StageWarning[] | undefined;
  const add = (message: string) => (out ??= []).push({ message });
  const ratio = p.r1 / p.r2;
  if (!t.oscillates) {
    add(
      `no oscillation: the triangle would have to reach ${v(-t.squareLow * ratio)} / ${v(-t.squareHigh * ratio)} to switch the comparator ` +
        `(square level × R1/R2, R1/R2 = ${ratio.toPrecision(3)}), but the integrator only swings ${v(p.high)} / ${v(p.low)}; ` +
        `the loop latches with the square stuck at one level. Make R1 smaller than R2 (or the square level lower). Frequency, duty and triangle targets are left empty.`,
    );
    return out ?? none;
  }
  const half = t.period / 2;
  const share = t.swingTime / half;
  if (share > slewShareUnreliable) {
    add(
      `the comparator's slew takes ${Math.round(share * 100)} % of each half period (full swing ${formatValue(t.swingTime, 's', { digits: 3 })} at ${formatValue(p.slew, 'V/s', { digits: 3 })}): ` +
        `the frequency is set by the op-amp's slew rate more than by Rt and Ct, and the model is unreliable this far; use a faster op-amp or a lower frequency.`,
    );
  } else if (share > slewShareNote) {
    add(
      `the comparator's slew takes ${Math.round(share * 100)} % of each half period: the frequency depends on the op-amp's slew rate (${formatValue(p.slew, 'V/s', { digits: 3 })} in the plan), which spreads widely between parts; expect readings spread wider than the band.`,
    );
  }
  const f = 1 / t.period;
  if (f > p.gbw / 10) {
    add(
      `${formatValue(f, 'Hz', { digits: 3 })} is above about a tenth of the op-amp's gain-bandwidth (${formatValue(p.gbw, 'Hz', { digits: 3 })}): a general-purpose op-amp gives out here and the targets are only a guide.`,
    );
  }
  if (t.overdriveTime > overdriveShareLimit * t.period) {
    add(
      `the triangle's swing at the comparator's input is small against the overdrive the op-amp needs to switch at full speed (about ${v(p.slew / (2 * Math.PI * p.gbw))}): ` +
        `it switches slowly and the targets are only approximate; raise R1/R2 or the square level.`,
    );
  }
  if (t.triangleMax > p.high || t.triangleMin < p.low) {
    add(
      `the triangle would peak at ${v(t.triangleMax)} / ${v(t.triangleMin)}, beyond the integrator's swing ${v(p.high)} / ${v(p.low)}: it clips, and the frequency target is approximate; lower R1/R2 or the slew share.`,
    );
  }
  const slope = Math.max(t.squareHigh, -t.squareLow) / (p.r * p.c);
  if (slope > p.slew) {
    add(
      `the triangle would ramp at ${formatValue(slope, 'V/s', { digits: 3 })}, faster than the integrator can slew (${formatValue(p.slew, 'V/s', { digits: 3 })}): the ramp is set by the op-amp, not by Rt and Ct; raise Rt or Ct.`,
    );
  }
  if (opts.hasClamp && t.clampReach <= 1) {
    const highOpen = t.squareHigh < p.vc;
    const lowOpen = t.squareLow > -(p.vcLow ?? p.vc);
    const where = highOpen && lowOpen ? 'never conducts' : highOpen ? 'does not conduct on the positive side' : 'does not conduct on the negative side';
    add(
      `the clamp ${where}: the comparator brings the square node only to about ${v(t.squareHigh)} / ${v(t.squareLow)}, against the zeners' ±${v(p.vc)}; the square follows the op-amp's swing there. Check vz, Rz and the rails.`,
    );
  }
  if (opts.hasClamp && !opts.hasRz) {
    add(
      `the clamp has no series resistor Rz: the zeners hold the comparator's output in current limit and it runs hot; fit Rz (e.g. "1k 5%") between the comparator and the square node.`,
    );
  }
  return out ?? none;
}
