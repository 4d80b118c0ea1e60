import { type Key, useInput } from 'ink';
import { keysWithRest } from '../components/key-chunks.js';
import { plainKey } from '../components/type-ahead.js';
import { useRef, useState, type Dispatch } from 'react';
import { useTextField } from '../components/use-text-field.js';
import { filterFields, formFromFilter, moveField, setFieldValue } from './filter-form-state.js';
import { batchReducer, selectedCheck, type BatchAction, type BatchState } from './use-batch-state.js';

export interface BatchKeyHandlers {
  readonly onExit: () => void;
  readonly onOpenBoard: (serial: string) => void;
  /** Told at once when the filter form opens or closes (the app's `q` is a letter meanwhile). */
  readonly onTypingChange?: ((isTyping: boolean) => void) | undefined;
}

/** Keys of the batch screen; the filter form's field (the one text field) takes the keyboard while the form is open. */
export function useBatchKeys(state: BatchState, dispatch: Dispatch<BatchAction>, handlers: BatchKeyHandlers, page: number, isActive: boolean) {
  // The state as of the last key, not the last render: keys can arrive faster
  // than React re-subscribes the handler, and each must act on the one before.
  // The reducer is pure, so it is applied here as well as by React.
  const latest = useRef(state);
  latest.current = state;
  // The filter form's help, over the form (the screen's own help stays for the screen).
  const [isFormHelpOpen, setFormHelpOpen] = useState(false);
  const formHelp = useRef(false);
  const showFormHelp = (isOpen: boolean) => {
    formHelp.current = isOpen;
    setFormHelpOpen(isOpen);
  };
  const act = (action: BatchAction) => {
    const wasTyping = latest.current.form !== null;
    latest.current = batchReducer(latest.current, action);
    dispatch(action);
    const isTyping = latest.current.form !== null;
    if (isTyping !== wasTyping) handlers.onTypingChange?.(isTyping);
  };
  const focusedValue = () => {
    const form = latest.current.form;
    return form ? form.values[filterFields[form.field] ?? 'plan'] : '';
  };
  const moveTo = (delta: number) => {
    const form = latest.current.form;
    if (!form) return;
    act({ type: 'form-edit', form: moveField(form, delta) });
    field.set(focusedValue());
  };
  const field = useTextField({
    isActive: false,
    onChange: (text) => {
      const form = latest.current.form;
      if (form) act({ type: 'form-edit', form: setFieldValue(form, text) });
    },
    onSubmit: () => act({ type: 'form-apply' }),
    onHelp: () => showFormHelp(true),
    onCancel: () => act({ type: 'back' }),
    onOtherKey: (_input, key) => {
      if (key.tab || key.downArrow) moveTo(key.shift ? -1 : 1);
      else if (key.upArrow) moveTo(-1);
    },
  });
  useInput(
    (chunk, key) => {
      // Keys typed fast arrive in one chunk ("jj", "f" with the filter text behind it): one at a time,
      // and what follows the key that opens the form is typed into it.
      // The open form takes the whole chunk (its help too).
      if (latest.current.form) return handle(chunk, key);
      for (const { input, rest } of keysWithRest(chunk, key)) {
        handle(input, key);
        if (latest.current.form) return rest ? field.handle(rest, plainKey) : undefined;
      }
    },
    { isActive },
  );
  function handle(input: string, key: Key) {
    const state = latest.current;
    if (state.form && formHelp.current) {
      if (input === '?' || key.escape) showFormHelp(false);
      return;
    }
    if (state.form) return field.handle(input, key);
    if (input === '?') return act({ type: 'toggle-help' });
    if (key.escape) {
      if (state.isHelpOpen || state.panel === 'outliers') return act({ type: 'back' });
      return handlers.onExit();
    }
    if (state.isHelpOpen) return;
    if (key.upArrow || input === 'k') return act({ type: 'move', delta: -1 });
    if (key.downArrow || input === 'j') return act({ type: 'move', delta: 1 });
    if (key.pageUp) return act({ type: 'move', delta: -page });
    if (key.pageDown) return act({ type: 'move', delta: page });
    if (key.tab) return act({ type: 'tab', delta: key.shift ? -1 : 1 });
    if (input === 'f') {
      act({ type: 'form-open' });
      return field.set(formFromFilter(state.filter).values.plan);
    }
    if (key.return) {
      if (state.panel === 'outliers') {
        const outlier = selectedCheck(state)?.outliers[state.outlierSelected];
        if (outlier) handlers.onOpenBoard(outlier.serial);
        return;
      }
      return act({ type: 'open' });
    }
  }
  return { cursor: field.cursor, isFormHelpOpen: isFormHelpOpen && state.form !== null };
}
