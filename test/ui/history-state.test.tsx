import { describe, expect, test } from 'vitest';
import type { BoardFile } from '../../src/log/types.js';
import { timelineOf } from '../../src/review/history.js';
import { historyReducer, initialHistoryState, type HistoryState } from '../../src/ui/history/use-history-state.js';

// An invented board with one run, one reading, one rework.
const board: BoardFile = {
  schemaVersion: 1,
  serial: 'PB-0007',
  plan: 'osc-demo',
  runs: [{ id: 'u1', started: '2026-11-02T09:00:00.000Z', ended: null, operator: 'tess', outcome: 'in-progress', plan: 'osc-demo', planHash: 'a'.repeat(64) }],
  readings: [
    {
      id: 'r1',
      run: 'u1',
      check: 'osc.freq',
      value: 16,
      unit: 'Hz',
      raw: '16',
      at: '2026-11-02T09:01:00.000Z',
      operator: 'tess',
      verdict: 'pass',
      planHash: 'a'.repeat(64),
    },
  ],
  rework: [{ id: 'w1', at: '2026-11-02T09:05:00.000Z', run: 'u1', part: 'osc.Rt', from: '15k', to: '16k', note: '', operator: 'tess' }],
  captures: [],
};
const ready: HistoryState = historyReducer(initialHistoryState, {
  type: 'loaded',
  data: { board, timeline: timelineOf(board, new Map()), bands: new Map(), problems: [] },
});

describe('history reducer', () => {
  test('moves within the timeline and refuses to leave it', () => {
    expect(ready.status).toBe('ready');
    expect(historyReducer(ready, { type: 'move', delta: -1 })).toBe(ready);
    const last = historyReducer(ready, { type: 'move', delta: 99 });
    expect(last.selected).toBe(2);
    expect(historyReducer(last, { type: 'move', delta: 1 })).toBe(last);
  });

  test('Enter on a reading opens its target; on a run does nothing; on a rework opens before/after', () => {
    expect(historyReducer(ready, { type: 'open' })).toBe(ready);
    const onReading = historyReducer(ready, { type: 'move', delta: 1 });
    expect(historyReducer(onReading, { type: 'open' }).view).toBe('target');
    const onRework = historyReducer(onReading, { type: 'move', delta: 1 });
    expect(historyReducer(onRework, { type: 'open' })).toMatchObject({ panel: 'rework', reworkSelected: 0, view: 'list' });
  });

  test('c draws a capture only for a reading that has one; Esc closes help before the view', () => {
    const target = historyReducer(historyReducer(ready, { type: 'move', delta: 1 }), { type: 'open' });
    expect(historyReducer(target, { type: 'draw-capture' })).toBe(target);
    const help = historyReducer(target, { type: 'toggle-help' });
    const back = historyReducer(help, { type: 'back' });
    expect(back).toMatchObject({ isHelpOpen: false, view: 'target' });
    expect(historyReducer(back, { type: 'back' }).view).toBe('list');
  });

  test('a board with no file is "missing"', () => {
    expect(historyReducer(initialHistoryState, { type: 'loaded', data: null }).status).toBe('missing');
  });
});
