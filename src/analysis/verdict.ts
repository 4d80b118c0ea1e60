import type { UncertaintySpec } from '../units/uncertainty.js';
import { uncertaintyOf } from '../units/uncertainty.js';
import type { Target, VerdictResult } from './types.js';

/**
 * The verdict on a reading, by the decision rule ILAC-G8:09/2019 calls guarded
 * acceptance, with the guard band w = U (the reading's expanded uncertainty)
 * and a non-binary statement: `pass` when reading ± U lies inside the
 * worst-case band, `fail` when it lies wholly outside, `marginal` when it
 * straddles an edge.
 *
 * A band that reaches down to the quantity's physical floor (`target.floor`: a
 * dead band of 0 V, a THD of 0) is guarded on its open side only: no true value
 * lies below the floor, so a reading at the floor passes (with a guard band on
 * both sides a perfect 0 V dead band could never pass). A reading more than U
 * below the floor is impossible and fails.
 */
export function verdictFor(target: Pick<Target, 'nominal' | 'worst' | 'floor'>, reading: number, spec: UncertaintySpec | undefined): VerdictResult {
  const { min, max } = target.worst;
  const warnings: string[] = [];
  // An over-range reading (a meter's OL on a resistance-to-ground check, +∞) has
  // no finite uncertainty: it is judged against the band's limits alone.
  const isOverRange = !Number.isFinite(reading);
  const u = spec && !isOverRange ? uncertaintyOf(reading, spec) : 0;
  const isAtFloor = target.floor !== undefined && min <= target.floor;
  // The guard band applies at the lower edge unless that edge is the physical floor.
  const lowGuard = isAtFloor ? -u : u;
  let verdict: VerdictResult['verdict'];
  if (Number.isNaN(reading)) verdict = 'fail';
  else if (reading - lowGuard >= min && reading + u <= max) verdict = 'pass';
  else if (reading + u < min || reading - u > max) verdict = 'fail';
  else verdict = 'marginal';
  if ((isAtFloor ? u : 2 * u) >= max - min)
    warnings.push('the instrument uncertainty is as wide as the band: this reading cannot pass; use a better instrument or range');
  const width = max - min;
  return {
    verdict,
    uncertainty: u,
    deviation: target.nominal === 0 ? Number.NaN : (reading - target.nominal) / Math.abs(target.nominal),
    position: width > 0 ? (reading - min) / width : reading === min ? 0.5 : reading < min ? -Infinity : Infinity,
    warnings,
  };
}

/** The uncertainty spec that applies to a check: its own override, else the plan's for its unit. */
export function uncertaintyFor(
  plan: { readonly uncertainty: Readonly<Partial<Record<string, UncertaintySpec>>>; readonly checkUncertainty: Readonly<Record<string, UncertaintySpec>> },
  check: string,
  unit: string,
): UncertaintySpec | undefined {
  return plan.checkUncertainty[check] ?? plan.uncertainty[unit];
}
