import { type Key, useInput } from 'ink';
import { splitKeys } from '../components/key-chunks.js';
import type { PlanScreenState } from './use-plan-screen-state.js';

/** Keys of the plan screen: move, page, Tab between the table and the warnings, e edit (when `onEdit` is given), ? help, Esc back. */
export function usePlanScreenKeys(state: PlanScreenState, pageSize: number, onExit: () => void, isActive: boolean, onEdit?: () => void) {
  const handle = (input: string, key: Key) => {
    if (state.isHelpOpen) {
      if (input === '?' || key.escape || key.return) state.closeHelp();
      return;
    }
    if (key.upArrow || input === 'k') state.move(-1);
    else if (key.downArrow || input === 'j') state.move(1);
    else if (key.pageUp) state.move(-pageSize);
    else if (key.pageDown || input === ' ') state.move(pageSize);
    else if (key.home || input === 'g') state.moveTo('first');
    else if (key.end || input === 'G') state.moveTo('last');
    else if (key.tab) state.switchPanel();
    else if (input === 'e' && onEdit) onEdit();
    else if (input === '?') state.toggleHelp();
    else if (key.escape) onExit();
  };
  useInput(
    (chunk, key) => {
      for (const input of splitKeys(chunk, key)) handle(input, key);
    },
    { isActive },
  );
}
