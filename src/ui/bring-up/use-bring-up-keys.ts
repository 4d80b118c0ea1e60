import { type Key, useInput } from 'ink';
import { splitKeys } from '../components/key-chunks.js';
import { hasInnerEnter } from '../components/text-field-state.js';
import type { BringUpScreenState } from './use-bring-up-screen-state.js';
import type { BringUp } from './use-bring-up-state.js';

/** Letters that act on the screen when typed into an empty reading line. */
const commands = new Set(['?', 'r', 'a', 'e', 'm', 'M']);

/**
 * The keyboard of the bring-up screen: one listener that asks the live state
 * which control has the keys and hands them over. It keeps no state of its
 * own. The capture box listens for itself while it is open.
 */
export function useBringUpKeys(run: BringUp, screen: BringUpScreenState, isActive: boolean) {
  const command = (input: string) => {
    if (input === '?') screen.toggleHelp();
    else if (input === 'r') screen.openRework();
    else if (input === 'a') screen.openCapture();
    else if (input === 'e') screen.openEnd();
    // m: one reading from the check's instrument; M: five, recorded as their mean.
    else if (input === 'm') run.measure(1);
    else if (input === 'M') run.measure(5);
  };

  const onList = (input: string, key: Key) => {
    if (key.upArrow || input === 'k') screen.moveList(-1);
    else if (key.downArrow || input === 'j') screen.moveList(1);
    else if (key.pageUp) screen.moveList(-10);
    else if (key.pageDown) screen.moveList(10);
    else if (key.return) screen.pickListed();
    else if (key.tab) screen.focus('input');
    else if (key.escape) screen.exit();
    else if (commands.has(input)) command(input);
  };

  const onEnd = (input: string, key: Key) => {
    if (key.escape) screen.focus('input');
    else if (key.upArrow || input === 'k') screen.moveEnd(-1);
    else if (key.downArrow || input === 'j') screen.moveEnd(1);
    else if (key.return) screen.endRun();
    else if (input === '?') screen.toggleHelp();
  };

  /** One key, or one piece of a chunk without Enter inside, to the control that has the keyboard now. */
  const route = (input: string, key: Key) => {
    const state = run.stateRef.current;
    const { focus, rework } = screen.screenRef.current;
    // While a resumed run is read back, keys would act on an empty run.
    if (run.statusRef.current.kind === 'loading') return;
    // While an instrument is asked, Esc cancels and the other keys wait (the screen keeps drawing).
    if (run.statusRef.current.kind === 'measuring') {
      if (key.escape) run.cancelMeasure();
      else if (input === '?') screen.toggleHelp();
      return;
    }
    if (focus === 'help') {
      if (input === '?' || key.escape) screen.toggleHelp();
      return;
    }
    if (state.ended || state.isCautionsPending) {
      if (key.escape) screen.exit();
      else if (input === '?') screen.toggleHelp();
      else if (key.return && !state.ended) run.acknowledgeCautions();
      return;
    }
    // Nothing else until the technician confirms the supply is off.
    if (state.isPowerOff) {
      if (key.return) run.acknowledgePowerOff();
      else if (input === '?') screen.toggleHelp();
      return;
    }
    if (focus === 'rework') {
      if (!rework.isSaving) screen.reworkField.handle(input, key);
    } else if (focus === 'end') for (const one of splitKeys(input, key)) onEnd(one, key);
    else if (focus === 'list') for (const one of splitKeys(input, key)) onList(one, key);
    else if (focus === 'input') {
      const isEmpty = screen.reading.current() === '';
      if (isEmpty && commands.has(input)) command(input);
      // `q` on an empty line is the app's (quit); no reading starts with it.
      else if (!(isEmpty && input === 'q')) screen.reading.handle(input, key);
    }
  };

  useInput(
    (input, key) => {
      // A pasted chunk (or keys sent in one write, as tmux does) may carry Enter inside it: each
      // piece goes to the control that has the keyboard after the piece before it.
      if (!hasInnerEnter(input, key)) return route(input, key);
      const pieces = input.split(/\r\n|\r|\n/);
      pieces.forEach((piece, i) => {
        if (piece) route(piece, { ...key, return: false });
        if (i < pieces.length - 1) route('', { ...key, return: true });
      });
    },
    { isActive: isActive && screen.screen.focus !== 'capture' },
  );
}
