import { describe, expect, test } from 'vitest';
import { initialScreenState, isTypingFocus, type ScreenState, screenReducer } from '../../src/ui/bring-up/screen-state.js';

const rework = { part: 'osc.Ct', from: '22n', to: '', note: '' };

describe('bring-up screen reducer', () => {
  test('help goes back to the control it was opened from', () => {
    let s = screenReducer(initialScreenState, { type: 'open-end' });
    s = screenReducer(s, { type: 'toggle-help' });
    expect(s.focus).toBe('help');
    expect(screenReducer(s, { type: 'toggle-help' }).focus).toBe('end');
    const inRework = screenReducer(initialScreenState, { type: 'open-rework', fields: rework });
    expect(screenReducer(screenReducer(inRework, { type: 'toggle-help' }), { type: 'toggle-help' })).toMatchObject({
      focus: 'rework',
      rework: { fields: rework },
    });
  });

  test('the rework form edits the focused field, moves within its four fields, and holds the keys while saving', () => {
    let s = screenReducer(initialScreenState, { type: 'open-rework', fields: rework });
    expect(s.rework.field).toBe('part');
    expect(screenReducer(s, { type: 'move-rework', delta: -1 })).toBe(s);
    s = screenReducer(s, { type: 'move-rework', delta: 2 });
    s = screenReducer(s, { type: 'edit-rework', text: '47n' });
    expect(s.rework.fields).toEqual({ ...rework, to: '47n' });
    s = screenReducer(s, { type: 'move-rework', delta: 5 });
    expect(s.rework.field).toBe('note');
    const saving = screenReducer(s, { type: 'rework-saving' });
    expect(saving.rework.isSaving).toBe(true);
    // While the note is written, Esc, help and edits change nothing.
    for (const action of [
      { type: 'focus', focus: 'input' },
      { type: 'toggle-help' },
      { type: 'edit-rework', text: 'x' },
      { type: 'move-rework', delta: -1 },
    ] as const) {
      expect(screenReducer(saving, action)).toBe(saving);
    }
    const failed = screenReducer(saving, { type: 'rework-saved', error: 'part must be <stage>.<part>' });
    expect(failed).toMatchObject({ focus: 'rework', rework: { isSaving: false, error: 'part must be <stage>.<part>' } });
    expect(screenReducer(saving, { type: 'rework-saved', error: null }).focus).toBe('input');
  });

  test('cursors stay in range; impossible moves return the same state', () => {
    const s: ScreenState = screenReducer(initialScreenState, { type: 'move-list', delta: 3, count: 10 });
    expect(s.listCursor).toBe(3);
    expect(screenReducer(s, { type: 'move-list', delta: 100, count: 10 }).listCursor).toBe(9);
    expect(screenReducer(s, { type: 'set-list', row: 3 })).toBe(s);
    expect(screenReducer(s, { type: 'move-end', delta: 1, count: 3 })).toBe(s);
    expect(screenReducer(initialScreenState, { type: 'rework-saved', error: null })).toBe(initialScreenState);
  });

  test('only the rework form and the capture box take letters as text', () => {
    expect((['input', 'list', 'end', 'help', 'rework', 'capture'] as const).filter(isTypingFocus)).toEqual(['rework', 'capture']);
  });
});
