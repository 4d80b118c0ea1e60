import { useCallback, useEffect, useRef, useState } from 'react';
import { type Key, useInput } from 'ink';
import type { TypeAhead } from './type-ahead.js';
import {
  defaultMaxLength,
  emptyField,
  type FieldStep,
  fieldSteps,
  fieldWith,
  type TextFieldAction,
  type TextFieldState,
  textFieldReducer,
} from './text-field-state.js';

export interface TextFieldOptions {
  /** Called with the text on Enter (also an Enter inside a pasted chunk, with the text before it). */
  readonly onSubmit: (text: string) => void;
  /** Called on Esc. */
  readonly onCancel: () => void;
  /** Called, at once, after every change of the text by a key. */
  readonly onChange?: (text: string) => void;
  /** Keys the field does not take (Tab, up, down, Ctrl letters…). */
  readonly onOtherKey?: (input: string, key: Key) => void;
  /** Called for `?` typed into the empty field (a dialog's help); without it `?` is text. */
  readonly onHelp?: () => void;
  /** The text to start with. @default '' */
  readonly initial?: string;
  /** Longest text accepted; more is ignored. @default 200 */
  readonly maxLength?: number;
  /**
   * Whether the field listens to the keyboard itself. A screen that routes
   * its keys through one handler passes false and calls `handle`. @default true
   */
  readonly isActive?: boolean;
  /** Keys typed for this field before it was on screen (the rest of the chunk that opened it), taken when it mounts. */
  readonly typeAhead?: TypeAhead;
}

/**
 * The one text field of the app: every editor (serial, filter, reading line,
 * rework note, batch filter, capture path) is this hook over the pure
 * `textFieldReducer`. The state lives in a ref as well as in React state,
 * because two chunks can arrive before one render.
 */
export function useTextField({
  onSubmit,
  onCancel,
  onChange,
  onOtherKey,
  onHelp,
  initial = '',
  maxLength = defaultMaxLength,
  isActive = true,
  typeAhead,
}: TextFieldOptions) {
  const [field, setField] = useState<TextFieldState>(() => (initial ? fieldWith(initial, maxLength) : emptyField));
  const latest = useRef(field);
  const handlers = useRef({ onSubmit, onCancel, onChange, onOtherKey, onHelp });
  handlers.current = { onSubmit, onCancel, onChange, onOtherKey, onHelp };

  const apply = useCallback(
    (action: TextFieldAction, isTyped: boolean) => {
      const next = textFieldReducer(latest.current, action, maxLength);
      if (next === latest.current) return;
      const isChanged = next.text !== latest.current.text;
      latest.current = next;
      setField(next);
      if (isChanged && isTyped) handlers.current.onChange?.(next.text);
    },
    [maxLength],
  );

  const step = useCallback(
    (s: FieldStep) => {
      if (s.kind === 'edit') apply(s.action, true);
      else if (s.kind === 'submit') handlers.current.onSubmit(latest.current.text);
      else if (s.kind === 'cancel') handlers.current.onCancel();
      else handlers.current.onOtherKey?.(s.input, s.key);
    },
    [apply],
  );

  /** Feed one chunk of keys, as Ink delivers it. */
  const handle = useCallback(
    (input: string, key: Key) => {
      // `?` alone in an empty field asks for help: no text starts with it, and a note can still say "why?".
      const help = handlers.current.onHelp;
      if (help && input === '?' && latest.current.text === '' && !key.ctrl && !key.meta) return help();
      fieldSteps(input, key).forEach(step);
    },
    [step],
  );

  // biome-ignore lint/correctness/useExhaustiveDependencies: taken once, when the field mounts
  useEffect(() => {
    for (const k of typeAhead?.drain() ?? []) handle(k.input, k.key);
  }, []);

  useInput(handle, { isActive });

  return {
    value: field.text,
    cursor: field.cursor,
    /** The text as of the last key, also before React renders it. */
    current: () => latest.current.text,
    /** Replace the text (not reported to `onChange`: the caller knows). */
    set: useCallback((text: string) => apply({ type: 'set', text }, false), [apply]),
    clear: useCallback(() => apply({ type: 'clear' }, false), [apply]),
    /** Feed one chunk of keys (for a screen that routes its keys through one handler). */
    handle,
  };
}

export type TextField = ReturnType<typeof useTextField>;
