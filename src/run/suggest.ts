import type { Verdict } from '../analysis/types.js';
import { nextCheck } from '../analysis/next-check.js';
import { currentReading, lockReason } from './gates.js';
import type { RunState, Suggestion } from './types.js';

/**
 * The suggested next check (DESIGN §5) for a state. Stale readings (made before
 * a rework or a power-off) do not count as done, so the reworked stage comes up
 * again. The run's own safety gates have the last word: should the suggestion
 * be locked, the first open check that can be made is offered instead.
 */
export function suggestNext(state: RunState): Suggestion | null {
  if (state.ended) return null;
  const done = new Map<string, Verdict>();
  for (const t of state.targets) {
    const r = currentReading(state, t.check);
    if (r) done.set(t.check, r.verdict);
  }
  const last = state.last && !state.stale.has(state.last.check) ? { check: state.last.check, verdict: state.last.verdict } : undefined;
  const proposed = nextCheck(state.targets, done, last);
  const gated = { ...state, isCautionsPending: false, isPowerOff: false };
  if (proposed && lockReason(gated, proposed.check) === null) return proposed;
  const open = state.targets.find((t) => !done.has(t.check) && lockReason(gated, t.check) === null);
  if (open) {
    const wasStale = state.stale.has(open.check);
    return { check: open.check, why: wasStale ? 'measure again: its reading was made before the latest rework or power-off' : 'next open check in safe order' };
  }
  return proposed;
}
