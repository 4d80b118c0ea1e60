import type { Hypothesis } from '../../analysis/diagnose.js';
import type { Plan } from '../../plan/types.js';
import { formatValue } from '../../units/format.js';
import type { ReworkFields } from './use-bring-up-state.js';
import type { ExplanationView } from './verdict-panel.js';

/** The fitted value of a part as the plan wrote it, or its rail's, or empty. */
function fittedText(plan: Plan, part: string): string {
  const [stage, ...role] = part.split('.');
  if (stage === 'rails') return plan.rails.find((r) => r.id === role.join('.'))?.text ?? '';
  return plan.stages.find((s) => s.id === stage)?.parts[role.join('.')]?.text ?? '';
}

/**
 * The rework form's start: the most likely fault of the diagnosis when there is
 * one (its part, the fitted value, and a note saying what the diagnosis found),
 * else the most likely part from the latest explanation.
 */
export function reworkDefaults(plan: Plan, explanations: readonly ExplanationView[], top?: Hypothesis): ReworkFields {
  if (top) {
    // "to" is what the technician fits: left for them; the note starts with what the diagnosis said.
    const found = top.mode === 'value' && top.value !== null && top.unit ? `${formatValue(top.value, top.unit)} found` : top.mode;
    return { part: top.part, from: fittedText(plan, top.part), to: '', note: `diagnosis ${found} (${Math.round(top.score * 100)} %); ` };
  }
  const first = explanations[0];
  if (!first) return { part: '', from: '', to: '', note: '' };
  return { part: first.part, from: fittedText(plan, first.part), to: '', note: '' };
}
