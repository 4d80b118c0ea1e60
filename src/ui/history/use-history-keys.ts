import { useInput } from 'ink';
import { useRef, type Dispatch } from 'react';
import type { HistoryAction, HistoryState } from './use-history-state.js';

/** Keys of the history screen; Esc leaves only from the list with nothing open. */
export function useHistoryKeys(state: HistoryState, dispatch: Dispatch<HistoryAction>, onExit: () => void, page: number, isActive: boolean) {
  // The state as of the latest render, read when the key arrives (not when the handler was bound).
  const latest = useRef(state);
  latest.current = state;
  useInput(
    (input, key) => {
      const state = latest.current;
      if (input === '?') return dispatch({ type: 'toggle-help' });
      if (key.escape) {
        if (state.isHelpOpen || state.view !== 'list') return dispatch({ type: 'back' });
        return onExit();
      }
      if (state.isHelpOpen) return;
      if (key.upArrow || input === 'k') return dispatch({ type: 'move', delta: -1 });
      if (key.downArrow || input === 'j') return dispatch({ type: 'move', delta: 1 });
      if (key.pageUp) return dispatch({ type: 'move', delta: -page });
      if (key.pageDown) return dispatch({ type: 'move', delta: page });
      if (input === 'g') return dispatch({ type: 'move', delta: -Infinity });
      if (input === 'G') return dispatch({ type: 'move', delta: Infinity });
      if (key.tab) return dispatch({ type: 'tab' });
      if (key.return) return dispatch({ type: 'open' });
      if (input === 'c') return dispatch({ type: 'draw-capture' });
    },
    { isActive },
  );
}
