import { type Key, useInput } from 'ink';
import { erasures, splitKeys } from '../components/key-chunks.js';
import { useEffect, useRef, useState } from 'react';
import { useLiveState } from '../components/use-live-state.js';
import { endOptions } from '../../run/gates.js';
import type { EndOutcome } from '../../run/types.js';
import { moveSelection } from '../components/scroll-window.js';
import { type ReworkField, reworkFieldNames } from './rework-form.js';
import type { BringUp, ReworkFields } from './use-bring-up-state.js';

export type Focus = 'input' | 'list' | 'rework' | 'end' | 'help' | 'capture';

export interface BringUpKeysOptions {
  readonly isActive: boolean;
  readonly onExit: () => void;
  readonly onDirtyChange: ((isDirty: boolean) => void) | undefined;
  readonly onTypingChange?: ((isTyping: boolean) => void) | undefined;
  /** The rework form's starting part and value (from the top explanation of a fail). */
  readonly reworkDefaults: () => ReworkFields;
}

const emptyRework: ReworkFields = { part: '', from: '', to: '', note: '' };
const printable = (input: string): string => input.replace(/[\u0000-\u001F\u007F]/g, '');

/** The keyboard of the bring-up screen, and the screen-local state it edits (input text, cursor, forms). */
export function useBringUpKeys(b: BringUp, { isActive, onExit, onDirtyChange, onTypingChange, reworkDefaults }: BringUpKeysOptions) {
  const [focus, setFocus, focusRef] = useLiveState<Focus>('input');
  const [text, setText, textRef] = useLiveState('');
  const [cursor, setCursor, cursorRef] = useLiveState(0);
  const [rework, setRework, reworkRef] = useLiveState<ReworkFields>(emptyRework);
  const [reworkFocus, setReworkFocus, reworkFocusRef] = useLiveState<ReworkField>('part');
  const [reworkError, setReworkError] = useState<string | null>(null);
  const [isReworkSaving, setReworkSaving] = useState(false);
  const [endCursor, setEndCursor, endCursorRef] = useLiveState(0);
  const dirty = useRef(onDirtyChange);
  dirty.current = onDirtyChange;

  const { state } = b;
  useEffect(() => {
    const i = state.targets.findIndex((t) => t.check === state.selected);
    if (i >= 0) setCursor(i);
  }, [state.selected, state.targets, setCursor]);

  // Forms count as half-typed too, so the app's `q` asks before quitting instead of losing them.
  const isDirty = text.trim() !== '' || focus === 'rework' || focus === 'capture';
  useEffect(() => {
    dirty.current?.(isDirty);
  }, [isDirty]);
  // In the rework and capture forms every letter is text: the app's `q` must not quit there.
  const typing = useRef(onTypingChange);
  typing.current = onTypingChange;
  const isTyping = focus === 'rework' || focus === 'capture';
  useEffect(() => {
    typing.current?.(isTyping);
  }, [isTyping]);

  const command = (input: string): boolean => {
    if (input === '?') setFocus('help');
    else if (input === 'r') {
      setRework(reworkDefaults());
      setReworkFocus('part');
      setReworkError(null);
      setFocus('rework');
    } else if (input === 'a') {
      // A capture needs a check that may take a reading now; a locked one says why instead.
      const selected = b.stateRef.current.selected;
      if (selected && b.select(selected) === null) setFocus('capture');
    }
    else if (input === 'e') {
      setEndCursor(0);
      setFocus('end');
    } else return false;
    return true;
  };

  const onRework = (input: string, key: Key) => {
    if (isReworkSaving) return;
    const reworkFocus = reworkFocusRef.current;
    const at = reworkFieldNames.indexOf(reworkFocus);
    if (key.escape) setFocus('input');
    else if (key.tab && key.shift) setReworkFocus(reworkFieldNames[Math.max(0, at - 1)] ?? 'part');
    else if (key.tab || (key.return && at < reworkFieldNames.length - 1)) setReworkFocus(reworkFieldNames[Math.min(reworkFieldNames.length - 1, at + 1)] ?? 'note');
    else if (key.return) {
      setReworkSaving(true);
      void b.saveRework(reworkRef.current).then((error) => {
        setReworkSaving(false);
        setReworkError(error);
        if (!error) setFocus('input');
      });
    } else if (erasures(input, key) > 0) setRework((r) => ({ ...r, [reworkFocus]: r[reworkFocus].slice(0, -erasures(input, key)) }));
    else if (!key.ctrl && !key.meta && printable(input)) setRework((r) => ({ ...r, [reworkFocus]: (r[reworkFocus] + printable(input)).slice(0, 200) }));
  };

  const onEnd = (key: Key, input: string) => {
    const options = endOptions(b.stateRef.current);
    if (key.escape) setFocus('input');
    else if (key.upArrow || input === 'k') setEndCursor((c) => moveSelection(c, -1, options.length));
    else if (key.downArrow || input === 'j') setEndCursor((c) => moveSelection(c, 1, options.length));
    else if (key.return) {
      const outcome = options[endCursorRef.current] as EndOutcome | undefined;
      if (outcome) void b.endRun(outcome);
      setFocus('input');
    }
  };

  const onList = (input: string, key: Key) => {
    const state = b.stateRef.current;
    if (key.upArrow || input === 'k') setCursor((c) => moveSelection(c, -1, state.targets.length));
    else if (key.downArrow || input === 'j') setCursor((c) => moveSelection(c, 1, state.targets.length));
    else if (key.pageUp) setCursor((c) => moveSelection(c, -10, state.targets.length));
    else if (key.pageDown) setCursor((c) => moveSelection(c, 10, state.targets.length));
    else if (key.return) {
      const check = state.targets[cursorRef.current]?.check;
      if (check && b.select(check) === null) setFocus('input');
    } else if (key.tab) setFocus('input');
    else if (key.escape) onExit();
    else command(input);
  };

  const onInput = (input: string, key: Key) => {
    const state = b.stateRef.current;
    const text = textRef.current;
    if (key.tab) setFocus('list');
    else if (key.escape) {
      if (text !== '') setText('');
      else onExit();
    } else if (key.return) {
      if (text.trim() === '') b.acceptSuggestion();
      else if (b.submit(text)) setText('');
    } else if (key.upArrow || key.downArrow) {
      setFocus('list');
      setCursor((c) => moveSelection(c, key.upArrow ? -1 : 1, state.targets.length));
    } else if (erasures(input, key) > 0) setText((t) => t.slice(0, -erasures(input, key)));
    else if (key.ctrl || key.meta) return;
    else if (text === '' && command(input)) return;
    else if (printable(input)) {
      setText((t) => (t + printable(input)).slice(0, 40));
      b.clearStatus();
    }
  };

  const handle = (input: string, key: Key) => {
      const state = b.stateRef.current;
      const focus = focusRef.current;
      // While a resumed run is read back, keys would act on an empty run.
      if (b.statusRef.current.kind === 'loading') return;
      if (focus === 'help') {
        if (input === '?' || key.escape) setFocus('input');
        return;
      }
      if (state.ended) {
        if (key.escape) onExit();
        else if (input === '?') setFocus('help');
        return;
      }
      if (state.isCautionsPending) {
        if (key.return) b.acknowledgeCautions();
        else if (key.escape) onExit();
        else if (input === '?') setFocus('help');
        return;
      }
      if (state.isPowerOff) {
        // Nothing else until the technician confirms the supply is off.
        if (key.return) b.acknowledgePowerOff();
        return;
      }
      if (focus === 'rework') onRework(input, key);
      else if (focus === 'end') onEnd(key, input);
      else if (focus === 'list') onList(input, key);
      else onInput(input, key);
  };

  useInput(
    (input, key) => {
      // A pasted chunk (or keys sent in one write, as tmux does) may carry Enter inside it.
      if (input.length > 1 && /[\r\n]/.test(input) && !key.ctrl && !key.meta) {
        const pieces = input.split(/\r\n|\r|\n/);
        pieces.forEach((piece, i) => {
          if (piece) handle(piece, { ...key, return: false });
          if (i < pieces.length - 1) handle('', { ...key, return: true });
        });
        return;
      }
      // The list and the end panel take one key at a time, so `jjk` sent in one write moves three times;
      // the reading line and the rework form keep a pasted value whole.
      const f = focusRef.current;
      if (f === 'list' || f === 'end') for (const one of splitKeys(input, key)) handle(one, key);
      else handle(input, key);
    },
    { isActive: isActive && focus !== 'capture' },
  );

  return {
    focus,
    text,
    cursor,
    rework: { fields: rework, focus: reworkFocus, error: reworkError, isSaving: isReworkSaving },
    endCursor,
    closeCapture: () => setFocus('input'),
  };
}
