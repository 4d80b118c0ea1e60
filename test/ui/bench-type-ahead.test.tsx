import { afterEach, describe, expect, test } from 'vitest';
import { keysWithRest } from '../../src/ui/components/key-chunks.js';
import { plainKey } from '../../src/ui/components/type-ahead.js';
import { keys } from './keys.js';
import { type RenderedApp, renderApp, seedBoard } from './render-app.js';

let app: RenderedApp | undefined;
afterEach(async () => {
  await app?.cleanup();
  app = undefined;
});

// Invented serials: two calibrator lots and one other board.
const withBoards = () =>
  renderApp({
    setup: async (log, [plan]) => {
      if (!plan) throw new Error('no plan');
      for (const serial of ['CAL-0001', 'CAL-0002', 'FX-0009']) await seedBoard(log, plan, serial, []);
    },
  });

/** The filter field's line, e.g. `filter: CAL▌ (Enter keeps it · Esc clears)`. */
const filterLine = (frame: string) => frame.split('\n').find((l) => l.includes('(Enter keeps it'));

describe('keys behind the key that opens a bench field', () => {
  test('"/CAL" written as one chunk opens the filter holding CAL', async () => {
    app = await withBoards();
    await app.waitFor('FX-0009');
    app.stdin.write('/CAL');
    await app.waitFor('2 of 3 boards');
    expect(filterLine(app.frame())).toMatch(/filter.*CAL/);
    expect(app.frame()).not.toContain('FX-0009');
    // The field goes on from there, as if CAL had been typed into it.
    await app.press('-0002');
    await app.waitFor('1 of 3 boards');
    expect(filterLine(app.frame())).toMatch(/CAL-0002/);
  });

  test('an Enter inside the chunk keeps the filter and closes the field', async () => {
    app = await withBoards();
    await app.waitFor('FX-0009');
    app.stdin.write('/fx\r');
    await app.waitFor((f) => f.includes('1 of 3 boards') && filterLine(f) === undefined);
    expect(app.frame()).toContain('FX-0009');
    expect(app.frame()).not.toContain('CAL-0001');
    // Back at the list: the keys are the list's again (Esc clears the filter).
    await app.press(keys.escape);
    await app.waitFor('3 boards');
    expect(app.frame()).toContain('CAL-0001');
  });

  test('chunks read before the field is drawn go into it too, in order (no list key acts on them)', async () => {
    app = await withBoards();
    await app.waitFor('FX-0009');
    // Three writes in one turn: Ink takes each before React draws the field.
    app.stdin.write('/');
    app.stdin.write('CA');
    app.stdin.write('L-0001');
    await app.waitFor('1 of 3 boards');
    expect(filterLine(app.frame())).toMatch(/CAL-0001/);
    expect(app.quitCount()).toBe(0);
  });

  test('"n" with a serial behind it in one chunk fills the new-board field; a q in it is a letter', async () => {
    app = await withBoards();
    await app.waitFor('FX-0009');
    app.stdin.write('nEXB-0042q');
    await app.waitFor('New board');
    await app.waitFor('EXB-0042q');
    expect(app.quitCount()).toBe(0);
  });
});

describe('keysWithRest', () => {
  test('printable keys one by one, each with the rest of the chunk behind it', () => {
    expect(keysWithRest('/CAL\r', plainKey)).toEqual([
      { input: '/', rest: 'CAL\r' },
      { input: 'C', rest: 'AL\r' },
      { input: 'A', rest: 'L\r' },
      { input: 'L', rest: '\r' },
    ]);
    // A character outside the basic plane is one key, never half of one.
    expect(keysWithRest('/Ω😀', plainKey).map((k) => k.input)).toEqual(['/', 'Ω', '😀']);
  });

  test('one key, a control key or a Ctrl chunk is one key with nothing behind it', () => {
    expect(keysWithRest('/', plainKey)).toEqual([{ input: '/', rest: '' }]);
    expect(keysWithRest('\r', { ...plainKey, return: true })).toEqual([{ input: '\r', rest: '' }]);
    expect(keysWithRest('\u007F\u007F', plainKey)).toEqual([{ input: '\u007F\u007F', rest: '' }]);
    expect(keysWithRest('u', { ...plainKey, ctrl: true })).toEqual([{ input: 'u', rest: '' }]);
  });
});
