import type { Target, Verdict } from '../analysis/types.js';
import { outputOf } from '../plan/check-output.js';
import { planChecks } from '../plan/checks.js';
import type { Plan } from '../plan/types.js';
import { formatValue } from '../units/format.js';
import type { Unit } from '../units/unit.js';
import { judge } from './assess.js';

/** A figure a scope capture gives (the capture analysis's names). */
export type CaptureFigure = NonNullable<Target['captureFigure']>;

/** A capture's figures by name, as the capture analysis measured them (null: not measured). */
export type CaptureFigureValues = Readonly<Record<CaptureFigure, number | null>>;

/** A reading to save from a capture figure. */
export interface PlannedReading {
  readonly check: string;
  readonly value: number;
  readonly unit: Unit;
  readonly raw: string;
  readonly verdict: Verdict;
}

/**
 * The readings a capture gives: for the current check, and for every other
 * check probed at the same output that may be recorded now (`canRecord`),
 * each answered by the capture figure its stage kind declares for it
 * (`CheckSpec.captureFigure`). A check without one (the pot-end frequencies,
 * which need the pot turned; a gain, which needs two channels) is not taken.
 * The declaration is read from the plan itself, so targets cached by an
 * older build cannot hide it.
 */
export function captureReadings(
  plan: Plan,
  targets: readonly Target[],
  current: Target,
  capture: { readonly name: string; readonly figures: CaptureFigureValues },
  canRecord: (check: string) => boolean,
): PlannedReading[] {
  const declared = new Map(planChecks(plan).map((c) => [c.check, c.captureFigure]));
  const where = outputOf(plan, current);
  const candidates = targets.filter((t) => t.check === current.check || (where !== null && outputOf(plan, t) === where));
  const out: PlannedReading[] = [];
  for (const t of candidates) {
    const figure = declared.get(t.check) ?? t.captureFigure;
    if (!figure || !canRecord(t.check)) continue;
    const value = capture.figures[figure];
    if (value === null || !Number.isFinite(value)) continue;
    out.push({
      check: t.check,
      value,
      unit: t.unit,
      raw: `${figure} ${formatValue(value, t.unit)} from ${capture.name}`,
      verdict: judge(plan, t, value).verdict,
    });
  }
  return out;
}
