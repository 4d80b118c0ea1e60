import { maxValueLength, parseValue } from '../units/parse.js';
import { type UncertaintySpec, parseUncertainty } from '../units/uncertainty.js';
import { type Unit, unitExample, unitNoun } from '../units/unit.js';
import { PlanError } from './errors.js';

/** A value read from a plan, in SI base units, with its tolerance as a fraction (0 when none written). */
export interface PlanValue {
  readonly value: number;
  readonly tol: number;
  readonly text: string;
}

/**
 * Read one value of a plan or throw a `PlanError` naming its path. Tolerances
 * must lie in [0, 100 %): a part cannot be more than wholly off.
 */
export function readValue(raw: string | number, unit: Unit, file: string, path: string, options: { allowTolerance?: boolean } = {}): PlanValue {
  const { allowTolerance = true } = options;
  if (typeof raw === 'number') {
    if (!Number.isFinite(raw)) throw new PlanError(file, path, `${raw} is not a finite number`);
    if (unit !== '1' && unit !== 'V/V') {
      throw new PlanError(file, path, `${raw} has no unit; write ${unitNoun[unit]} as text, e.g. ${unitExample[unit]}`);
    }
    return { value: raw, tol: 0, text: String(raw) };
  }
  if (/(^|\s)-\s*\d+(\.\d+)?\s*%\s*$/.test(raw)) {
    throw new PlanError(file, path, `${JSON.stringify(raw)} has a negative tolerance; a tolerance is a plain percentage, e.g. ${unitExample[unit]}`);
  }
  const parsed = parseValue(raw, { expected: unit, allowTolerance });
  if (!parsed.ok) throw new PlanError(file, path, parsed.message);
  const tol = parsed.tol ?? 0;
  checkTolerance(tol, raw, file, path);
  return { value: parsed.value, tol, text: raw };
}

/** Throws unless 0 ≤ tol < 1. */
export function checkTolerance(tol: number, text: string, file: string, path: string): void {
  if (!Number.isFinite(tol) || tol < 0) throw new PlanError(file, path, `${JSON.stringify(text)}: a tolerance cannot be negative; write e.g. "5%"`);
  if (tol >= 1)
    throw new PlanError(
      file,
      path,
      `${JSON.stringify(text)}: a tolerance of ${Math.round(tol * 100)} % or more is impossible (the part could be zero); write the part's real tolerance, e.g. "20%"`,
    );
}

/** A separate tolerance such as `"3%"`. */
export function readTolerance(raw: string, file: string, path: string): number {
  // Capped before the pattern runs: its two runs of optional spaces backtrack quadratically on long input.
  if (raw.length > maxValueLength) throw new PlanError(file, path, `a tolerance of ${raw.length} characters; write a percentage, e.g. "3%"`);
  const m = /^\s*±?\s*(-?\d+(?:\.\d+)?)\s*%\s*$/.exec(raw);
  if (!m) throw new PlanError(file, path, `${JSON.stringify(raw)} is not a tolerance; write a percentage, e.g. "3%"`);
  const tol = Number(m[1]) / 100;
  checkTolerance(tol, raw, file, path);
  return tol;
}

/** An instrument uncertainty, e.g. `"0.5% + 2 mV"`. */
export function readUncertainty(raw: string, unit: Unit, file: string, path: string): UncertaintySpec {
  const spec = parseUncertainty(raw, unit);
  if (typeof spec === 'string') throw new PlanError(file, path, spec);
  return spec;
}
