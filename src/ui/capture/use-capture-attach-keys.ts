import { type Key, useInput } from 'ink';
import type { RefObject } from 'react';
import type { AttachState } from './use-capture-attach-state.js';
import { erasures } from '../components/key-chunks.js';

export interface AttachKeyActions {
  readonly type: (chars: string) => void;
  readonly erase: () => void;
  readonly complete: () => void;
  readonly load: () => void;
  readonly back: () => void;
  readonly attach: () => void;
  readonly cancel: () => void;
}

/**
 * Keys of the attach box. Path: type, Backspace, Tab completes, Enter reads,
 * Esc cancels. Reading: Esc stops waiting. Figures: Enter attaches, Esc picks
 * another file.
 */
export function useCaptureAttachKeys(latest: RefObject<AttachState>, actions: AttachKeyActions, isActive: boolean): void {
  useInput(
    (input: string, key: Key) => {
      const { phase } = latest.current;
      if (phase.kind === 'loading') {
        if (key.escape) actions.back();
        return;
      }
      if (phase.kind === 'done') {
        if (key.return) actions.attach();
        else if (key.escape || key.backspace || key.delete) actions.back();
        return;
      }
      if (key.escape) actions.cancel();
      else if (key.return) actions.load();
      else if (key.tab) actions.complete();
      else if (erasures(input, key) > 0) for (let n = erasures(input, key); n > 0; n--) actions.erase();
      else if (!key.ctrl && !key.meta && !key.upArrow && !key.downArrow && !key.leftArrow && !key.rightArrow && input.length > 0) {
        // Pasted text arrives as one chunk; keep only its printable part.
        const printable = input.replace(/[\u0000-\u001F\u007F]/g, '');
        if (printable) actions.type(printable);
      }
    },
    { isActive },
  );
}
