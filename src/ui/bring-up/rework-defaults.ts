import type { Plan } from '../../plan/types.js';
import type { ReworkFields } from './screen-state.js';
import type { ExplanationView } from './verdict-panel.js';

/** The rework form's start: the most likely part from the latest explanation, with its fitted value. */
export function reworkDefaults(plan: Plan, explanations: readonly ExplanationView[]): ReworkFields {
  const top = explanations[0];
  if (!top) return { part: '', from: '', to: '', note: '' };
  const [stage, ...role] = top.part.split('.');
  const fitted = plan.stages.find((s) => s.id === stage)?.parts[role.join('.')]?.text ?? '';
  return { part: top.part, from: fitted, to: '', note: '' };
}
