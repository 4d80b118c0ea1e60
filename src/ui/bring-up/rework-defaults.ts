import type { Hypothesis } from '../../analysis/diagnose.js';
import type { Plan } from '../../plan/types.js';
import { formatValue } from '../../units/format.js';
import type { ReworkFields } from './screen-state.js';
import type { ExplanationView } from './verdict-panel.js';

/** What was found, for the note's "from" when the fault is not a value. */
const faultWords: Readonly<Record<Hypothesis['mode'], string>> = {
  value: 'wrong value',
  reversed: 'fitted backwards',
  open: 'open',
  short: 'shorted',
  missing: 'not fitted',
};

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
    const found =
      top.mode === 'value' && top.value !== null && top.unit
        ? `${formatValue(top.value, top.unit)} found`
        : `${top.mode}${top.variantWords ? `, ${top.variantWords}` : ''}`;
    const from = top.mode === 'value' ? fittedText(plan, top.part) : `${top.ref ?? 'part'} ${faultWords[top.mode]}`;
    return { part: top.part, from, to: '', note: `diagnosis ${found} (${Math.round(top.score * 100)} %); ` };
  }
  const first = explanations[0];
  if (!first) return { part: '', from: '', to: '', note: '' };
  return { part: first.part, from: fittedText(plan, first.part), to: '', note: '' };
}
