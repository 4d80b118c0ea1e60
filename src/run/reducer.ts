import { applyPowerOff, applyReading, applyRework } from './apply.js';
import { endOptions, lockReason } from './gates.js';
import { replay } from './resume.js';
import { suggestNext } from './suggest.js';
import type { RunAction, RunState } from './types.js';

/** Recompute the suggestion after a change. */
function withSuggestion(state: RunState): RunState {
  return { ...state, suggestion: suggestNext(state) };
}

/**
 * The bring-up run as a pure reducer (STYLE.md point 5). Impossible moves
 * return the very same state object, so a caller can tell "nothing happened"
 * by identity. Safety gates: nothing is recorded before the cautions are
 * acknowledged; nothing powered before the unpowered checks and the idle
 * current; after an idle current above its limit only the power-off
 * acknowledgement is accepted.
 */
export function runReducer(state: RunState, action: RunAction): RunState {
  switch (action.type) {
    case 'acknowledge-cautions': {
      if (!state.isCautionsPending || state.ended) return state;
      return withSuggestion({ ...state, isCautionsPending: false });
    }
    case 'power-off-acknowledged': {
      if (!state.isPowerOff || state.isCautionsPending) return state;
      const next = withSuggestion(applyPowerOff(state));
      return { ...next, selected: next.suggestion?.check ?? next.selected };
    }
    case 'select-check': {
      if (state.selected === action.check) return state;
      if (lockReason(state, action.check) !== null) return state;
      return { ...state, selected: action.check };
    }
    case 'record-reading': {
      const { reading } = action;
      const target = state.targets.find((t) => t.check === reading.check);
      // An open circuit (`OL`) is the one non-finite reading that makes sense: a resistance.
      const isOpen = target?.unit === 'Ω' && reading.value === Infinity;
      if (!target || target.unit !== reading.unit || (!Number.isFinite(reading.value) && !isOpen)) return state;
      if (lockReason(state, reading.check) !== null) return state;
      if (state.readings.some((r) => r.id === reading.id)) return state;
      return withSuggestion(applyReading(state, reading));
    }
    case 'note-rework': {
      if (state.ended || state.isCautionsPending || state.isPowerOff) return state;
      if (action.rework.part.trim() === '' || state.rework.some((r) => r.id === action.rework.id)) return state;
      const next = withSuggestion(applyRework(state, action.rework));
      return { ...next, selected: next.suggestion?.check ?? next.selected };
    }
    case 'resume': {
      if (state.readings.length > 0 || state.rework.length > 0 || state.ended) return state;
      const ended = action.ended ?? null;
      if (action.readings.length === 0 && (action.rework ?? []).length === 0 && !ended) return state;
      const replayed = replay(state, action.readings, action.rework ?? []);
      return ended ? { ...replayed, ended, isCautionsPending: false, isPowerOff: false, suggestion: null } : replayed;
    }
    case 'end-run': {
      if (state.isPowerOff || state.isCautionsPending || !endOptions(state).includes(action.outcome)) return state;
      return { ...state, ended: action.outcome, suggestion: null };
    }
    default:
      return state;
  }
}
