import { isOverLimit } from './gates.js';
import { stagesAffectedBy } from './graph.js';
import type { RunReading, RunRework, RunState } from './types.js';

/** Store a saved reading, without the gates (shared with resume, where the log is the truth). */
export function applyReading(state: RunState, reading: RunReading): RunState {
  const target = state.targets.find((t) => t.check === reading.check);
  if (!target) return state;
  const latest = new Map(state.latest);
  latest.set(reading.check, reading);
  const stale = new Set(state.stale);
  stale.delete(reading.check);
  return {
    ...state,
    readings: [...state.readings, reading],
    latest,
    stale,
    last: reading,
    isPowerOff: isOverLimit(target, reading.value),
    selected: reading.check,
  };
}

/** Store a saved rework note: the readings of the stages it can change no longer count. */
export function applyRework(state: RunState, rework: RunRework): RunState {
  const affected = stagesAffectedBy(rework.part, state.downstream);
  const stale = new Set(state.stale);
  for (const t of state.targets) {
    if (!state.latest.has(t.check)) continue;
    if (affected === 'all' || affected.has(t.stage)) stale.add(t.check);
  }
  return { ...state, rework: [...state.rework, rework], stale, last: null };
}

/** Power is off again: the rails must be measured to ground again to find the fault. */
export function applyPowerOff(state: RunState): RunState {
  const stale = new Set(state.stale);
  for (const t of state.targets) if (t.phase === 'unpowered' && state.latest.has(t.check)) stale.add(t.check);
  return { ...state, isPowerOff: false, stale };
}
