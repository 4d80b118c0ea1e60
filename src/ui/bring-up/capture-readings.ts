import type { Target, Verdict } from '../../analysis/types.js';
import type { Plan } from '../../plan/types.js';
import { judge } from '../../run/assess.js';
import type { Measurements } from '../../signal/types.js';
import { formatValue } from '../../units/format.js';
import type { Unit } from '../../units/unit.js';
import { outputOf } from './expected-trace.js';

/** A capture as the attach component hands it over. */
export interface CaptureFigures {
  readonly name: string;
  readonly bytes: Uint8Array;
  readonly measurements: Measurements;
  readonly samples: Float64Array;
  readonly sampleRate: number;
  /** One period averaged over the capture, from a rising mean-level crossing (empty when none). */
  readonly period?: Float64Array;
}

/** A reading to save from a capture figure. */
export interface PlannedReading {
  readonly check: string;
  readonly value: number;
  readonly unit: Unit;
  readonly raw: string;
  readonly verdict: Verdict;
}

/** Which capture figure answers a check, by the check's last key part (DESIGN §4 ids). */
const figureFor: Readonly<Record<string, { readonly field: 'frequency' | 'vpp' | 'duty' | 'thd' | 'mean'; readonly unit: Unit }>> = {
  freq: { field: 'frequency', unit: 'Hz' },
  vpp: { field: 'vpp', unit: 'V' },
  duty: { field: 'duty', unit: '1' },
  thd: { field: 'thd', unit: '1' },
  dc: { field: 'mean', unit: 'V' },
};

/**
 * The readings a capture gives: for the current check, and for every other
 * check probed at the same output that the capture also measures and that
 * may be recorded now (`canRecord`). Pot-end frequencies (`freq.min`,
 * `freq.max`) are not taken: the capture shows one pot setting.
 */
export function captureReadings(plan: Plan, targets: readonly Target[], current: Target, capture: CaptureFigures, canRecord: (check: string) => boolean): PlannedReading[] {
  const where = outputOf(plan, current);
  const candidates = targets.filter((t) => t.check === current.check || (where !== null && outputOf(plan, t) === where));
  const out: PlannedReading[] = [];
  for (const t of candidates) {
    const last = t.check.split('.').slice(-1)[0] ?? '';
    const figure = figureFor[last];
    if (!figure || figure.unit !== t.unit || !canRecord(t.check)) continue;
    const value = capture.measurements[figure.field];
    if (value === null || !Number.isFinite(value)) continue;
    out.push({ check: t.check, value, unit: t.unit, raw: `${figure.field} ${formatValue(value, t.unit)} from ${capture.name}`, verdict: judge(plan, t, value).verdict });
  }
  return out;
}

/** What looks wrong in a capture's shape, in words: a shape other than the expected one, clipping, a crossover notch. */
export function captureWarnings(m: Pick<Measurements, 'shape' | 'clipped' | 'notch'>, expected: string | undefined): string[] {
  const out: string[] = [];
  if (expected && m.shape !== expected) out.push(`the capture looks like a ${m.shape === 'other' ? 'distorted wave' : m.shape} where a ${expected} is expected`);
  if (m.clipped) out.push('the capture is clipped (flat tops): check the stage gain and the rails');
  if (m.notch) out.push('the capture shows a crossover notch: check the output stage bias');
  return out;
}
