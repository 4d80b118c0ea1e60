import { useEffect, useRef } from 'react';
import { endOptions } from '../../run/gates.js';
import type { EndOutcome } from '../../run/types.js';
import { useLiveState } from '../components/use-live-state.js';
import { useTextField } from '../components/use-text-field.js';
import { type Focus, initialScreenState, isTypingFocus, type ReworkFields, type ScreenAction, screenReducer } from './screen-state.js';
import type { BringUp } from './use-bring-up-state.js';

export interface ScreenStateOptions {
  readonly onExit: () => void;
  /** Told at once when a reading or a form is half typed (the app's `q` then asks first). */
  readonly onDirtyChange: ((isDirty: boolean) => void) | undefined;
  /** Told at once when a control that takes letters as text gets or loses the keyboard. */
  readonly onTypingChange?: ((isTyping: boolean) => void) | undefined;
  /** The rework form's starting part and value (from the top explanation of a fail). */
  readonly reworkDefaults: () => ReworkFields;
}

/**
 * The bring-up screen's own state over the pure `screenReducer`, with its two
 * text fields (the reading line and the rework field being edited). Every
 * move is applied to a live ref at once, and the app hears of typing and
 * half-typed text in the same key event, not after the next render: a `q`
 * that follows an `r` in the same breath is a letter of the note, never quit.
 */
export function useBringUpScreenState(run: BringUp, { onExit, onDirtyChange, onTypingChange, reworkDefaults }: ScreenStateOptions) {
  const [screen, setScreen, screenRef] = useLiveState(initialScreenState);
  const told = useRef({ isTyping: false, isDirty: false });
  const callbacks = useRef({ onExit, onDirtyChange, onTypingChange, reworkDefaults });
  callbacks.current = { onExit, onDirtyChange, onTypingChange, reworkDefaults };

  const tell = () => {
    const focus = screenRef.current.focus;
    const isTyping = isTypingFocus(focus);
    // Forms count as half-typed too, so the app's `q` asks before quitting instead of losing them.
    const isDirty = reading.current().trim() !== '' || isTyping;
    if (isTyping !== told.current.isTyping) callbacks.current.onTypingChange?.(isTyping);
    if (isDirty !== told.current.isDirty) callbacks.current.onDirtyChange?.(isDirty);
    told.current = { isTyping, isDirty };
  };
  const dispatch = (action: ScreenAction) => {
    setScreen((s) => screenReducer(s, action));
    tell();
  };

  const reading = useTextField({
    isActive: false,
    onChange: () => {
      run.clearStatus();
      tell();
    },
    onSubmit: (text) => {
      if (text.trim() === '') run.acceptSuggestion();
      else if (run.submit(text)) {
        reading.clear();
        tell();
      }
    },
    onCancel: () => {
      if (reading.current() === '') callbacks.current.onExit();
      else {
        reading.clear();
        tell();
      }
    },
    onOtherKey: (_input, key) => {
      if (key.tab) dispatch({ type: 'focus', focus: 'list' });
      else if (key.upArrow || key.downArrow) {
        dispatch({ type: 'focus', focus: 'list' });
        moveList(key.upArrow ? -1 : 1);
      }
    },
  });

  const moveReworkField = (delta: number) => {
    dispatch({ type: 'move-rework', delta });
    const { rework } = screenRef.current;
    reworkField.set(rework.fields[rework.field]);
  };
  const reworkField = useTextField({
    isActive: false,
    onChange: (text) => dispatch({ type: 'edit-rework', text }),
    onSubmit: () => {
      const { rework } = screenRef.current;
      if (rework.field !== 'note') return moveReworkField(1);
      dispatch({ type: 'rework-saving' });
      void run.saveRework(rework.fields).then((error) => dispatch({ type: 'rework-saved', error }));
    },
    onCancel: () => dispatch({ type: 'focus', focus: 'input' }),
    onHelp: () => dispatch({ type: 'toggle-help' }),
    onOtherKey: (_input, key) => {
      if (key.tab) moveReworkField(key.shift ? -1 : 1);
    },
  });

  const moveList = (delta: number) => dispatch({ type: 'move-list', delta, count: run.stateRef.current.targets.length });

  // The list cursor follows the selected check (a suggestion taken, a check picked).
  const { selected, targets } = run.state;
  useEffect(() => {
    const row = targets.findIndex((t) => t.check === selected);
    if (row >= 0) setScreen((s) => screenReducer(s, { type: 'set-list', row }));
  }, [selected, targets, setScreen]);

  return {
    screen,
    screenRef,
    reading,
    reworkField,
    focus: (focus: Focus) => dispatch({ type: 'focus', focus }),
    toggleHelp: () => dispatch({ type: 'toggle-help' }),
    exit: () => callbacks.current.onExit(),
    moveList,
    /** Take the check under the list cursor. */
    pickListed: () => {
      const check = run.stateRef.current.targets[screenRef.current.listCursor]?.check;
      if (check && run.select(check) === null) dispatch({ type: 'focus', focus: 'input' });
    },
    openRework: () => {
      const fields = callbacks.current.reworkDefaults();
      dispatch({ type: 'open-rework', fields });
      reworkField.set(fields.part);
    },
    /** Open the capture box for the selected check; a locked check says why instead. */
    openCapture: () => {
      const check = run.stateRef.current.selected;
      if (check && run.select(check) === null) dispatch({ type: 'focus', focus: 'capture' });
    },
    closeCapture: () => dispatch({ type: 'focus', focus: 'input' }),
    openEnd: () => dispatch({ type: 'open-end' }),
    moveEnd: (delta: number) => dispatch({ type: 'move-end', delta, count: endOptions(run.stateRef.current).length }),
    endRun: () => {
      const outcome = endOptions(run.stateRef.current)[screenRef.current.endCursor] as EndOutcome | undefined;
      if (outcome) void run.endRun(outcome);
      dispatch({ type: 'focus', focus: 'input' });
    },
  };
}

export type BringUpScreenState = ReturnType<typeof useBringUpScreenState>;
