import { useInput } from 'ink';
import type { Dispatch } from 'react';
import { editForm, moveField } from './filter-form-state.js';
import { selectedCheck, type BatchAction, type BatchState } from './use-batch-state.js';

/** Keys of the batch screen; the filter form takes the keyboard while it is open. */
export function useBatchKeys(
  state: BatchState,
  dispatch: Dispatch<BatchAction>,
  handlers: { readonly onExit: () => void; readonly onOpenBoard: (serial: string) => void },
  page: number,
  isActive: boolean,
) {
  useInput(
    (input, key) => {
      const form = state.form;
      if (form) {
        if (key.escape) return dispatch({ type: 'back' });
        if (key.return) return dispatch({ type: 'form-apply' });
        if (key.tab || key.downArrow) return dispatch({ type: 'form-edit', form: moveField(form, key.shift ? -1 : 1) });
        if (key.upArrow) return dispatch({ type: 'form-edit', form: moveField(form, -1) });
        if (key.backspace || key.delete) return dispatch({ type: 'form-edit', form: editForm(form, '', true) });
        if (key.ctrl || key.meta || key.leftArrow || key.rightArrow) return;
        return dispatch({ type: 'form-edit', form: editForm(form, input, false) });
      }
      if (input === '?') return dispatch({ type: 'toggle-help' });
      if (key.escape) {
        if (state.isHelpOpen || state.panel === 'outliers') return dispatch({ type: 'back' });
        return handlers.onExit();
      }
      if (state.isHelpOpen) return;
      if (key.upArrow || input === 'k') return dispatch({ type: 'move', delta: -1 });
      if (key.downArrow || input === 'j') return dispatch({ type: 'move', delta: 1 });
      if (key.pageUp) return dispatch({ type: 'move', delta: -page });
      if (key.pageDown) return dispatch({ type: 'move', delta: page });
      if (key.tab) return dispatch({ type: 'tab', delta: key.shift ? -1 : 1 });
      if (input === 'f') return dispatch({ type: 'form-open' });
      if (key.return) {
        if (state.panel === 'outliers') {
          const outlier = selectedCheck(state)?.outliers[state.outlierSelected];
          if (outlier) handlers.onOpenBoard(outlier.serial);
          return;
        }
        return dispatch({ type: 'open' });
      }
    },
    { isActive },
  );
}
