import { applyPowerOff, applyReading, applyRework } from './apply.js';
import { suggestNext } from './suggest.js';
import type { RunReading, RunRework, RunState } from './types.js';

type Event = { readonly at: string; readonly reading: RunReading } | { readonly at: string; readonly rework: RunRework };

/**
 * Rebuild a run from what the log holds for it, so it continues exactly where
 * it stopped. Readings and rework notes are replayed in time order without the
 * gates: the log is the truth, and a reading recorded out of order is still a
 * fact. Anything logged after an idle-current stop means the power-off was
 * acknowledged then. The cautions are shown again: this is a new sitting, and
 * nobody knows what the bench looks like now.
 */
export function replay(fresh: RunState, readings: readonly RunReading[], rework: readonly RunRework[]): RunState {
  const events: Event[] = [...readings.map((r) => ({ at: r.at, reading: r })), ...rework.map((w) => ({ at: w.at, rework: w }))];
  // Stable sort by time: ties keep the log's own order (readings before rework notes of the same instant).
  events.sort((a, b) => (a.at < b.at ? -1 : a.at > b.at ? 1 : 0));
  let state = fresh;
  for (const event of events) {
    if (state.isPowerOff) state = applyPowerOff(state);
    state = 'reading' in event ? applyReading(state, event.reading) : applyRework(state, event.rework);
  }
  state = { ...state, isCautionsPending: true };
  const suggestion = suggestNext(state);
  const selected = suggestion?.check ?? state.selected;
  return { ...state, suggestion, selected };
}
