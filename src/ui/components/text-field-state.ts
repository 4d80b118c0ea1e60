import type { Key } from 'ink';

/** One line of text being edited, and where the cursor is (0 … text.length). */
export interface TextFieldState {
  readonly text: string;
  readonly cursor: number;
}

/** Longest text a field takes unless it says otherwise; more is ignored. */
export const defaultMaxLength = 200;

export type TextFieldAction =
  | { readonly type: 'insert'; readonly text: string }
  /** Backspace: erase `count` characters before the cursor. */
  | { readonly type: 'erase'; readonly count: number }
  | { readonly type: 'move'; readonly delta: number }
  | { readonly type: 'home' }
  | { readonly type: 'end' }
  /** Ctrl-U: the whole line goes. */
  | { readonly type: 'clear' }
  /** Replace the text (a form moving to another field, a completion); the cursor goes to its end. */
  | { readonly type: 'set'; readonly text: string };

export const emptyField: TextFieldState = { text: '', cursor: 0 };

export function fieldWith(text: string, maxLength = defaultMaxLength): TextFieldState {
  const clipped = [...text].slice(0, maxLength).join('');
  return { text: clipped, cursor: clipped.length };
}

const controlChars = /[\u0000-\u001F\u007F]/g;

/**
 * The field after one action. Impossible moves (erasing at the start, typing
 * into a full field) return the same state. Lengths count UTF-16 units, as
 * the terminal delivers them; the cap is on code points so a pasted emoji is never cut in half.
 */
export function textFieldReducer(state: TextFieldState, action: TextFieldAction, maxLength = defaultMaxLength): TextFieldState {
  const { text, cursor } = state;
  switch (action.type) {
    case 'insert': {
      const room = maxLength - [...text].length;
      const typed = [...action.text.replace(controlChars, '')].slice(0, Math.max(0, room)).join('');
      if (typed === '') return state;
      return { text: text.slice(0, cursor) + typed + text.slice(cursor), cursor: cursor + typed.length };
    }
    case 'erase': {
      const from = Math.max(0, cursor - action.count);
      if (from === cursor) return state;
      return { text: text.slice(0, from) + text.slice(cursor), cursor: from };
    }
    case 'move': {
      const next = Math.min(text.length, Math.max(0, cursor + action.delta));
      return next === cursor ? state : { text, cursor: next };
    }
    case 'home':
      return cursor === 0 ? state : { text, cursor: 0 };
    case 'end':
      return cursor === text.length ? state : { text, cursor: text.length };
    case 'clear':
      return text === '' ? state : emptyField;
    case 'set':
      return action.text === text && cursor === text.length ? state : fieldWith(action.text, maxLength);
  }
}

/**
 * What one chunk of keys means to a text field, in order. Ink hands a handler
 * one chunk at a time; fast typing, a paste or a terminal multiplexer puts
 * several keys in one (`"4k7\r"`, a held Backspace as `"\x7f\x7f\x7f"`, a path
 * ending in a newline). `submit` stands for Enter where it fell, so what came
 * before it is submitted and what follows goes on as new keys; `key` is any
 * key the field does not take (Tab, arrows up and down, Esc, Ctrl letters),
 * left to the field's owner.
 */
export type FieldStep =
  | { readonly kind: 'edit'; readonly action: TextFieldAction }
  | { readonly kind: 'submit' }
  | { readonly kind: 'cancel' }
  | { readonly kind: 'key'; readonly input: string; readonly key: Key };

export function fieldSteps(input: string, key: Key): FieldStep[] {
  if (key.escape) return [{ kind: 'cancel' }];
  if (key.return) return [{ kind: 'submit' }];
  // Ink reports the Backspace key of most terminals (DEL, 0x7f) as `delete`, the same as the
  // Delete key (ESC [3~), and gives no way to tell them apart: both erase before the cursor.
  if (key.backspace || key.delete) return [{ kind: 'edit', action: { type: 'erase', count: 1 } }];
  if (key.leftArrow) return [{ kind: 'edit', action: { type: 'move', delta: -1 } }];
  if (key.rightArrow) return [{ kind: 'edit', action: { type: 'move', delta: 1 } }];
  if (key.home) return [{ kind: 'edit', action: { type: 'home' } }];
  if (key.end) return [{ kind: 'edit', action: { type: 'end' } }];
  // Ctrl-U clears the line (the line-editing key of terminals; common practice, no source).
  if (key.ctrl && input === 'u') return [{ kind: 'edit', action: { type: 'clear' } }];
  if (key.ctrl || key.meta || key.tab || key.upArrow || key.downArrow || key.pageUp || key.pageDown || input === '') return [{ kind: 'key', input, key }];
  const steps: FieldStep[] = [];
  let run = '';
  const flush = () => {
    if (run) steps.push({ kind: 'edit', action: { type: 'insert', text: run } });
    run = '';
  };
  for (let i = 0; i < input.length; i++) {
    const ch = input[i] ?? '';
    if (ch === '\r' || ch === '\n') {
      flush();
      // CR LF (a pasted Windows line) is one Enter.
      if (ch === '\r' && input[i + 1] === '\n') i++;
      steps.push({ kind: 'submit' });
    } else if (ch === '\u007F' || ch === '\b') {
      flush();
      const last = steps[steps.length - 1];
      if (last?.kind === 'edit' && last.action.type === 'erase')
        steps[steps.length - 1] = { kind: 'edit', action: { type: 'erase', count: last.action.count + 1 } };
      else steps.push({ kind: 'edit', action: { type: 'erase', count: 1 } });
    } else if (ch === '\u0015') {
      flush();
      steps.push({ kind: 'edit', action: { type: 'clear' } });
    } else if (ch === '\t') {
      // A tab inside pasted text is a space in a one-line field.
      run += ' ';
    } else run += ch;
  }
  flush();
  return steps;
}

/** Whether a chunk holds Enter among other keys (a paste or a multiplexer's batch). */
export function hasInnerEnter(input: string, key: Key): boolean {
  return input.length > 1 && /[\r\n]/.test(input) && !key.ctrl && !key.meta;
}
