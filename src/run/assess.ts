import type { Target, VerdictResult } from '../analysis/types.js';
import { uncertaintyFor, verdictFor } from '../analysis/verdict.js';
import type { Plan } from '../plan/types.js';
import { parseValue } from '../units/parse.js';
import type { Unit } from '../units/unit.js';

/** A typed reading that is ready to save, with its verdict. */
export interface Assessed {
  readonly ok: true;
  readonly value: number;
  readonly unit: Unit;
  readonly raw: string;
  readonly result: VerdictResult;
}

/** A typed reading that is not a value of the check's quantity: the message to show. */
export interface Rejected {
  readonly ok: false;
  readonly message: string;
}

// What meters show for an open circuit on a resistance range.
const openCircuit = /^(ol|o\.l\.?|open|inf|∞)$/i;

/**
 * Read what a technician typed for a check (`4.98k`, `4k98`, `4.98 kHz`,
 * `-11.9`, `12.1V`; `OL` on a resistance check) and judge it against the
 * check's worst-case band with the instrument's guard band.
 */
export function assessReading(plan: Pick<Plan, 'uncertainty' | 'checkUncertainty' | 'decimalComma'>, target: Target, text: string): Assessed | Rejected {
  const raw = text.trim();
  if (target.unit === 'Ω' && openCircuit.test(raw)) {
    // An open circuit carries no uncertainty figure a meter spec could scale.
    return { ok: true, value: Number.POSITIVE_INFINITY, unit: 'Ω', raw, result: verdictFor(target, Number.POSITIVE_INFINITY, undefined) };
  }
  const parsed = parseValue(raw, { expected: target.unit, allowTolerance: false, decimalComma: plan.decimalComma === true });
  if (!parsed.ok) return { ok: false, message: parsed.message };
  const spec = uncertaintyFor(plan, target.check, target.unit);
  return { ok: true, value: parsed.value, unit: parsed.unit, raw, result: verdictFor(target, parsed.value, spec) };
}

/** The verdict with its figures for a saved value (for the verdict panel). */
export function judge(plan: Pick<Plan, 'uncertainty' | 'checkUncertainty'>, target: Target, value: number): VerdictResult {
  if (value === Number.POSITIVE_INFINITY && target.unit === 'Ω') return verdictFor(target, value, undefined);
  return verdictFor(target, value, uncertaintyFor(plan, target.check, target.unit));
}
