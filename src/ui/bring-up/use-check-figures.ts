import { useMemo } from 'react';
import { expectedTrace, nominalOutputs } from '../../analysis/expected-trace.js';
import type { Target, TargetSet } from '../../analysis/types.js';
import type { Plan } from '../../plan/types.js';
import { judge } from '../../run/assess.js';
import { lockReason } from '../../run/gates.js';
import { scopeSetup } from '../../run/scope-setup.js';
import type { RunState } from '../../run/types.js';
import { idealShape } from '../../signal/ideal-shape.js';

/**
 * What the screen shows about the selected check and the latest reading,
 * each computed by the core and kept between keystrokes: the expected trace
 * and its shape, the scope settings, why the check is locked, the verdict.
 */
export function useCheckFigures(plan: Plan, targets: TargetSet, state: RunState, target: Target | null, lastTarget: Target | undefined) {
  const outputs = useMemo(() => nominalOutputs(plan), [plan]);
  const trace = useMemo(() => (target ? expectedTrace(plan, targets.targets, target, outputs) : null), [plan, targets, target, outputs]);
  const shape = useMemo(() => (trace ? idealShape(trace.samples) : undefined), [trace]);
  const scope = useMemo(() => (target?.instrument === 'scope' && trace ? scopeSetup(trace.frequency, trace.vpp) : null), [target, trace]);
  const last = state.last;
  const verdict = useMemo(() => (last && lastTarget ? judge(plan, lastTarget, last.value) : null), [plan, last, lastTarget]);
  const lock = useMemo(() => (target ? lockReason(state, target.check) : null), [state, target]);
  return { trace, shape, scope, verdict, lock };
}
