import type { Target } from '../analysis/types.js';
import type { RunReading, RunState } from './types.js';

/** The latest reading of a check that still counts (none when stale). */
export function currentReading(state: Pick<RunState, 'latest' | 'stale'>, check: string): RunReading | undefined {
  return state.stale.has(check) ? undefined : state.latest.get(check);
}

/** Whether an idle-current reading is above its limit (the band's top), the power-off trigger. */
export function isOverLimit(target: Target, value: number): boolean {
  return target.phase === 'first-power' && value > target.worst.max;
}

/**
 * Why power may not be applied yet, or null when it may: every unpowered check
 * (rail resistance to ground, polarity) needs a current reading that passes;
 * a marginal one is read again (it may be a short at the edge of the limit). A rail that reads a few ohms to ground unpowered is a short until
 * proven otherwise (common practice, no source).
 */
export function firstPowerBlock(state: RunState): string | null {
  for (const t of state.targets) {
    if (t.phase !== 'unpowered') continue;
    const r = currentReading(state, t.check);
    if (!r) return `unpowered checks first: measure ${t.check} before applying power`;
    if (r.verdict === 'fail') return `${t.check} failed: find the fault before applying power`;
    if (r.verdict === 'marginal') return `${t.check} is marginal: measure it again (or find the fault) before applying power`;
  }
  return null;
}

/**
 * Why powered checks may not be made yet, or null: the unpowered checks, then the
 * idle current through a current-limited supply, passing. One above its limit
 * stops the run (power-off); a marginal one keeps the gate shut until it is
 * read again and passes.
 */
export function poweredBlock(state: RunState): string | null {
  const first = firstPowerBlock(state);
  if (first) return first;
  for (const t of state.targets) {
    if (t.phase !== 'first-power') continue;
    const r = currentReading(state, t.check);
    if (!r) return `first power through a current-limited supply: measure ${t.check} first`;
    if (isOverLimit(t, r.value) || r.verdict === 'fail') return `${t.check} is above its limit: find the fault, then measure it again`;
    if (r.verdict === 'marginal') return `${t.check} is at its limit: look for a warm part, then read it again`;
  }
  return null;
}

/** Why a check cannot take a reading now, or null when it can. */
export function lockReason(state: RunState, check: string): string | null {
  const target = state.targets.find((t) => t.check === check);
  if (!target) return `${check} is not a check of this plan`;
  if (state.ended) return 'the run has ended';
  if (state.isCautionsPending) return 'read and acknowledge the cautions first';
  if (state.isPowerOff) return 'power off: acknowledge the power-off first';
  if (target.phase === 'unpowered') return null;
  if (target.phase === 'first-power') return firstPowerBlock(state);
  return poweredBlock(state);
}

/** Checks without a current reading, in plan order. */
export function openChecks(state: RunState): readonly string[] {
  return state.targets.filter((t) => !currentReading(state, t.check)).map((t) => t.check);
}

/** Which outcomes the run may end with now: `passed` only when every check has a current reading and none fails. */
export function endOptions(state: RunState): readonly ('passed' | 'failed' | 'aborted')[] {
  if (state.ended) return [];
  const allMeasured = openChecks(state).length === 0;
  const anyFail = state.targets.some((t) => currentReading(state, t.check)?.verdict === 'fail');
  return allMeasured && !anyFail ? ['passed', 'failed', 'aborted'] : ['failed', 'aborted'];
}
