import { type Key, useInput } from 'ink';
import type { RefObject } from 'react';
import type { TextField } from '../components/use-text-field.js';
import type { AttachState } from './use-capture-attach-state.js';

export interface AttachKeyActions {
  readonly back: () => void;
  readonly attach: () => void;
  /** Open or close the box's help (`?`; in the path field only while it is empty). */
  readonly toggleHelp: () => void;
  readonly isHelpOpen: () => boolean;
}

/**
 * Keys of the attach box, through one listener that asks the live phase
 * which control has them. Path: the text field (Tab completes, Enter reads,
 * Esc cancels; a pasted path ending in a newline is read). Reading: Esc stops
 * waiting. Figures: Enter attaches, Esc or Backspace picks another file.
 */
export function useCaptureAttachKeys(latest: RefObject<AttachState>, field: TextField, actions: AttachKeyActions, isActive: boolean): void {
  useInput(
    (input: string, key: Key) => {
      const { phase } = latest.current;
      if (actions.isHelpOpen()) {
        if (input === '?' || key.escape) actions.toggleHelp();
      } else if (phase.kind === 'path') field.handle(input, key);
      else if (input === '?') actions.toggleHelp();
      else if (phase.kind === 'loading') {
        if (key.escape) actions.back();
      } else if (key.return) actions.attach();
      else if (key.escape || key.backspace || key.delete) actions.back();
    },
    { isActive },
  );
}
