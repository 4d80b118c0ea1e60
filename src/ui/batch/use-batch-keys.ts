import { useInput } from 'ink';
import { useRef, type Dispatch } from 'react';
import { editForm, moveField } from './filter-form-state.js';
import { selectedCheck, type BatchAction, type BatchState } from './use-batch-state.js';
import { erasures } from '../components/key-chunks.js';

/** Keys of the batch screen; the filter form takes the keyboard while it is open. */
export function useBatchKeys(
  state: BatchState,
  dispatch: Dispatch<BatchAction>,
  handlers: { readonly onExit: () => void; readonly onOpenBoard: (serial: string) => void },
  page: number,
  isActive: boolean,
) {
  // The state as of the last key, not the last render: keys can arrive faster
  // than React re-subscribes the handler, and each must act on the one before.
  const latest = useRef(state);
  latest.current = state;
  const edit = (form: NonNullable<BatchState['form']>) => {
    latest.current = { ...latest.current, form };
    dispatch({ type: 'form-edit', form });
  };
  useInput(
    (input, key) => {
      const state = latest.current;
      const form = state.form;
      if (form) {
        if (key.escape) return dispatch({ type: 'back' });
        if (key.return) return dispatch({ type: 'form-apply' });
        if (key.tab || key.downArrow) return edit(moveField(form, key.shift ? -1 : 1));
        if (key.upArrow) return edit(moveField(form, -1));
        const erased = erasures(input, key);
        if (erased > 0) {
          let next = form;
          for (let n = 0; n < erased; n++) next = editForm(next, '', true);
          return edit(next);
        }
        if (key.ctrl || key.meta || key.leftArrow || key.rightArrow) return;
        return edit(editForm(form, input, false));
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
