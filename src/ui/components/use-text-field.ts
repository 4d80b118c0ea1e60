import { useEffect, useRef, useState } from 'react';
import { type Key, useInput } from 'ink';

export interface TextFieldOptions {
  /** Called with the text on Enter. */
  readonly onSubmit: (text: string) => void;
  /** Called on Esc. */
  readonly onCancel: () => void;
  /** Called after every change of the text. */
  readonly onChange?: (text: string) => void;
  /** The text to start with. @default '' */
  readonly initial?: string;
  /** Longest text accepted; more is ignored. @default 64 */
  readonly maxLength?: number;
  /** @default true */
  readonly isActive?: boolean;
}

/** A one-line text entry: printable keys append, Backspace deletes, Enter submits, Esc cancels. */
export function useTextField({ onSubmit, onCancel, onChange, initial = '', maxLength = 64, isActive = true }: TextFieldOptions) {
  const [value, setValueState] = useState(initial);
  // The latest text, also between renders: two chunks can arrive before one.
  const latest = useRef(initial);
  const setValue = (next: string) => {
    latest.current = next;
    setValueState(next);
  };
  const changed = useRef(onChange);
  changed.current = onChange;
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    changed.current?.(value);
  }, [value]);
  useInput(
    (input: string, key: Key) => {
      if (key.escape) return onCancel();
      if (key.return) return onSubmit(latest.current);
      if (key.backspace || key.delete) return setValue(latest.current.slice(0, -1));
      if (key.ctrl || key.meta || key.tab || key.upArrow || key.downArrow || key.leftArrow || key.rightArrow) return;
      // Fast typing, a paste or a terminal multiplexer can deliver several keys in
      // one chunk ("4k7\r"): take them one by one, so Enter and Backspace still act.
      let text = latest.current;
      for (const ch of input) {
        if (ch === '\r' || ch === '\n') {
          setValue(text);
          return onSubmit(text);
        }
        if (ch === '\u007F' || ch === '\b') text = text.slice(0, -1);
        else if (!/[\u0000-\u001F]/.test(ch)) text = (text + ch).slice(0, maxLength);
      }
      setValue(text);
    },
    { isActive },
  );
  return { value, setValue };
}
