import { type Key, useInput } from 'ink';
import { useState } from 'react';
import { keysWithRest } from '../components/key-chunks.js';
import { plainKey, TypeAhead } from '../components/type-ahead.js';
import type { BenchMode, BenchState } from './use-bench-state.js';

/**
 * Keys of the bench screen. The serial and filter fields take their own keys
 * (see `new-board.tsx`, `board-filter.tsx`); this hook is idle meanwhile.
 * Keys that arrive behind the key opening a field (in its chunk, or before the
 * field is on screen) are kept in the returned `typeAhead` for the field.
 */
export function useBenchKeys(state: BenchState, pageSize: number, isActive: boolean, onTypingChange?: (isTyping: boolean) => void) {
  const { mode } = state;
  const isTyping = mode.kind === 'new-serial' || mode.kind === 'filter' || mode.kind === 'busy';
  // Made once (a `useRef(new TypeAhead())` would build one per render and drop it).
  const [typeAhead] = useState(() => new TypeAhead());
  useInput(
    (chunk, key) => {
      // A field is opening but not yet on screen: this chunk is typed into it.
      if (typeAhead.isCollecting) return typeAhead.push(chunk, key);
      for (const { input, rest } of keysWithRest(chunk, key)) {
        handle(input, key);
        if (typeAhead.isCollecting) return typeAhead.push(rest, plainKey);
      }
    },
    { isActive: isActive && !isTyping },
  );

  /** Open a text field, telling the app at once (a `q` right behind `n` is a letter, not quit). */
  function startTyping(next: BenchMode) {
    onTypingChange?.(true);
    typeAhead.open();
    state.setMode(next);
  }

  function handle(input: string, key: Key) {
    if (mode.kind === 'help') {
      if (input === '?' || key.escape || key.return) state.setMode(mode.from);
      return;
    }
    // Every dialog answers `?` with its own help, and comes back as it was.
    if (input === '?') return state.setMode({ kind: 'help', from: mode });
    if (mode.kind === 'confirm-run') {
      if (key.return || input === 'y') state.confirmRun();
      else if (key.escape || input === 'n') state.setMode({ kind: 'list' });
      return;
    }
    if (mode.kind === 'choose-plan') {
      if (key.upArrow || input === 'k') state.movePlanChoice(-1);
      else if (key.downArrow || input === 'j') state.movePlanChoice(1);
      else if (key.return) state.choosePlan();
      else if (key.escape) state.setMode({ kind: 'list' });
      return;
    }
    const count = state.boards.length;
    const move = state.moveBy;
    if (key.upArrow || input === 'k') move(-1);
    else if (key.downArrow || input === 'j') move(1);
    else if (key.pageUp) move(-pageSize);
    else if (key.pageDown || input === ' ') move(pageSize);
    else if (key.home || input === 'g') state.moveBy(-count);
    else if (key.end || input === 'G') state.moveBy(count);
    else if (key.return) state.openSelected();
    else if (input === 'n') {
      state.setMessage(null);
      startTyping({ kind: 'new-serial' });
    } else if (input === '/') startTyping({ kind: 'filter' });
    else if (input === 'h') state.openHistory();
    else if (input === 'b') state.openBatch();
    else if (input === 'p') state.openPlan();
    else if (key.escape) {
      if (state.filter) state.setFilter('');
      state.setMessage(null);
    }
  }
  return { typeAhead };
}
