import fc from 'fast-check';
import type { Key } from 'ink';
import { describe, expect, test } from 'vitest';
import {
  defaultMaxLength,
  emptyField,
  type FieldStep,
  fieldSteps,
  fieldWith,
  type TextFieldState,
  textFieldReducer,
} from '../../../src/ui/components/text-field-state.js';
import { plainKey } from '../../../src/ui/components/type-ahead.js';

/** A key as Ink's useInput reports it, every flag off unless given. */
const key = (over: Partial<Key> = {}): Key => ({ ...plainKey, ...over });

/** Apply every edit of a chunk, collecting what was submitted (the text at each Enter). */
function feed(state: TextFieldState, input: string, k: Key = key(), max = defaultMaxLength) {
  const submitted: string[] = [];
  const other: FieldStep[] = [];
  let now = state;
  for (const step of fieldSteps(input, k)) {
    if (step.kind === 'edit') now = textFieldReducer(now, step.action, max);
    else if (step.kind === 'submit') submitted.push(now.text);
    else other.push(step);
  }
  return { state: now, submitted, other };
}

describe('text field reducer', () => {
  test('inserts at the cursor, erases before it, moves within the text', () => {
    let s = textFieldReducer(emptyField, { type: 'insert', text: '4k7' });
    expect(s).toEqual({ text: '4k7', cursor: 3 });
    s = textFieldReducer(s, { type: 'move', delta: -2 });
    s = textFieldReducer(s, { type: 'insert', text: '.' });
    expect(s).toEqual({ text: '4.k7', cursor: 2 });
    s = textFieldReducer(s, { type: 'erase', count: 1 });
    expect(s).toEqual({ text: '4k7', cursor: 1 });
    expect(textFieldReducer(s, { type: 'home' })).toEqual({ text: '4k7', cursor: 0 });
    expect(textFieldReducer(s, { type: 'end' })).toEqual({ text: '4k7', cursor: 3 });
    expect(textFieldReducer(s, { type: 'clear' })).toEqual(emptyField);
    expect(textFieldReducer(s, { type: 'set', text: 'scope/a.csv' })).toEqual({ text: 'scope/a.csv', cursor: 11 });
  });

  test('impossible moves return the same state', () => {
    const s = fieldWith('abc');
    expect(textFieldReducer(s, { type: 'move', delta: 1 })).toBe(s);
    expect(textFieldReducer(s, { type: 'end' })).toBe(s);
    expect(textFieldReducer(emptyField, { type: 'erase', count: 3 })).toBe(emptyField);
    expect(textFieldReducer(emptyField, { type: 'clear' })).toBe(emptyField);
    expect(textFieldReducer(s, { type: 'insert', text: '\u0007' })).toBe(s);
    const full = fieldWith('x'.repeat(defaultMaxLength));
    expect(textFieldReducer(full, { type: 'insert', text: 'y' })).toBe(full);
  });

  test('caps the text at 200 characters, cutting a paste, never half a code point', () => {
    expect(feed(emptyField, 'a'.repeat(250)).state.text).toHaveLength(200);
    const nearlyFull = fieldWith('a'.repeat(199));
    expect(textFieldReducer(nearlyFull, { type: 'insert', text: '😀😀' }).text).toBe(`${'a'.repeat(199)}😀`);
  });

  test('property: the cursor stays inside the text and the text under the cap, whatever the keys', () => {
    const action = fc.oneof(
      fc.record({ type: fc.constant('insert' as const), text: fc.string({ maxLength: 30 }) }),
      fc.record({ type: fc.constant('erase' as const), count: fc.integer({ min: 1, max: 40 }) }),
      fc.record({ type: fc.constant('move' as const), delta: fc.integer({ min: -50, max: 50 }) }),
      fc.constant({ type: 'home' as const }),
      fc.constant({ type: 'end' as const }),
      fc.constant({ type: 'clear' as const }),
    );
    fc.assert(
      fc.property(fc.array(action, { maxLength: 60 }), fc.integer({ min: 1, max: 50 }), (actions, max) => {
        let s = emptyField;
        for (const a of actions) {
          s = textFieldReducer(s, a, max);
          expect(s.cursor).toBeGreaterThanOrEqual(0);
          expect(s.cursor).toBeLessThanOrEqual(s.text.length);
          expect([...s.text].length).toBeLessThanOrEqual(max);
          expect(s.text).not.toMatch(/[\u0000-\u001F\u007F]/);
        }
      }),
    );
  });
});

describe('what a chunk of keys means to a field', () => {
  test('a pasted path ending in Enter is typed and then submitted', () => {
    const got = feed(emptyField, 'scope/osc-square.csv\r');
    expect(got.submitted).toEqual(['scope/osc-square.csv']);
    expect(got.state.text).toBe('scope/osc-square.csv');
    // A Windows line ending is one Enter, a bare LF too.
    expect(feed(emptyField, 'a.csv\r\n').submitted).toEqual(['a.csv']);
    expect(feed(emptyField, 'a.csv\n').submitted).toEqual(['a.csv']);
  });

  test('Enter inside a chunk submits what came before it; what follows is typed after', () => {
    const got = feed(emptyField, '4k7\r12');
    expect(got.submitted).toEqual(['4k7']);
    // The owner clears on submit; the reducer alone keeps typing on.
    expect(got.state.text).toBe('4k712');
  });

  test('a run of Backspaces in one chunk erases that many, as one edit', () => {
    expect(fieldSteps('\u007F\u007F\u007F', key())).toEqual([{ kind: 'edit', action: { type: 'erase', count: 3 } }]);
    expect(feed(fieldWith('FX/01'), '\u007F\u007F\u007F-0001').state.text).toBe('FX-0001');
    // Ink reports the Backspace key alone (DEL) as `delete`: it erases before the cursor too.
    expect(feed(fieldWith('ab'), '', key({ delete: true })).state.text).toBe('a');
    expect(feed(fieldWith('ab'), '', key({ backspace: true })).state.text).toBe('a');
  });

  test('cursor keys, Ctrl-U, and keys the field leaves to its owner', () => {
    let s = feed(fieldWith('12'), '', key({ leftArrow: true })).state;
    s = feed(s, '.').state;
    expect(s.text).toBe('1.2');
    s = feed(s, '', key({ rightArrow: true })).state;
    expect(s.cursor).toBe(3);
    expect(feed(s, 'u', key({ ctrl: true })).state).toEqual(emptyField);
    // Ctrl-U inside a pasted chunk clears what came before it.
    expect(feed(emptyField, 'old\u0015new').state.text).toBe('new');
    for (const k of [key({ tab: true }), key({ upArrow: true }), key({ downArrow: true }), key({ ctrl: true })]) {
      expect(fieldSteps(k.ctrl ? 'x' : '', k)).toEqual([{ kind: 'key', input: k.ctrl ? 'x' : '', key: k }]);
    }
    expect(fieldSteps('', key({ escape: true }))).toEqual([{ kind: 'cancel' }]);
    expect(fieldSteps('', key({ return: true }))).toEqual([{ kind: 'submit' }]);
  });
});
