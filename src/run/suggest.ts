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
  const fresh = state.last && !state.stale.has(state.last.check) ? state.last : null;
  // A wrong shape counts at least as marginal for where to look next (DESIGN §5: upstream first).
  const shapeOff = fresh?.shapeWarning !== undefined && fresh.verdict === 'pass';
  const last = fresh ? { check: fresh.check, verdict: shapeOff ? ('marginal' as const) : fresh.verdict } : undefined;
  const suggested = nextCheck(state.targets, done, last);
  const proposed = suggested && shapeOff && fresh ? { check: suggested.check, why: `${fresh.shapeWarning}; ${suggested.why}` } : suggested;
  const gated = { ...state, isCautionsPending: false, isPowerOff: false };
  if (proposed && lockReason(gated, proposed.check) === null)
    return state.stale.has(proposed.check) ? { check: proposed.check, why: againWhy(state) } : proposed;
  const open = state.targets.find((t) => !done.has(t.check) && lockReason(gated, t.check) === null);
  if (open) {
    return { check: open.check, why: state.stale.has(open.check) ? againWhy(state) : 'next open check in safe order' };
  }
  return proposed;
}

/** Why a check that already had a reading is suggested again. */
function againWhy(state: RunState): string {
  const rework = state.rework.at(-1);
  return rework ? `measure again: the reading came before the rework of ${rework.part}` : 'measure again: the reading came before the power-off';
}
