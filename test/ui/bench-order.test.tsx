import { describe, expect, test } from 'vitest';
import type { BoardSummary } from '../../src/log/types.js';
import { filterBoards, formatWhen, orderBoards } from '../../src/ui/bench/board-order.js';
import { fitHints } from '../../src/ui/components/key-bar.js';
import { cell } from '../../src/ui/components/columns.js';
import { moveSelection, scrollWindow } from '../../src/ui/components/scroll-window.js';

const board = (serial: string, lastRunAt: string | null, plan = 'p1'): BoardSummary => ({
  serial,
  plan,
  planHash: null,
  state: 'passed',
  lastRunAt,
  runs: 1,
  readings: 0,
  rework: 0,
  checks: {},
});

describe('board order', () => {
  test('latest activity first, boards without runs last, ties by serial', () => {
    const order = orderBoards([
      board('B', '2026-11-02T10:00:00.000Z'),
      board('A', null),
      board('C', '2026-11-03T09:00:00.000Z'),
      board('D', '2026-11-02T10:00:00.000Z'),
    ]).map((b) => b.serial);
    expect(order).toEqual(['C', 'B', 'D', 'A']);
  });

  test('the filter matches serial or plan, ignoring case', () => {
    const boards = [board('EXB-0001', null, 'exciter-b'), board('LD-0002', null, 'line-driver')];
    expect(filterBoards(boards, 'exb').map((b) => b.serial)).toEqual(['EXB-0001']);
    expect(filterBoards(boards, 'DRIVER').map((b) => b.serial)).toEqual(['LD-0002']);
    expect(filterBoards(boards, '  ')).toHaveLength(2);
  });

  test('times read as local date and minute; a missing time is a dash', () => {
    const local = new Date(2026, 10, 3, 9, 5);
    expect(formatWhen(local.toISOString())).toBe('2026-11-03 09:05');
    expect(formatWhen(null)).toBe('—');
    expect(formatWhen('not a date')).toBe('—');
  });
});

describe('scroll window', () => {
  test('keeps the selection in view and scrolls only when it would leave', () => {
    expect(scrollWindow(5, 4, 10)).toEqual({ start: 0, end: 5 });
    expect(scrollWindow(100, 0, 10)).toEqual({ start: 0, end: 10 });
    expect(scrollWindow(100, 10, 10, 0)).toEqual({ start: 1, end: 11 });
    expect(scrollWindow(100, 5, 10, 3)).toEqual({ start: 3, end: 13 });
    expect(scrollWindow(100, 2, 10, 3)).toEqual({ start: 2, end: 12 });
    expect(scrollWindow(100, 99, 10, 0)).toEqual({ start: 90, end: 100 });
  });

  test('moves clamp to the list', () => {
    expect(moveSelection(0, -1, 10)).toBe(0);
    expect(moveSelection(8, 5, 10)).toBe(9);
    expect(moveSelection(3, 1, 0)).toBe(0);
  });
});

describe('columns and key bar', () => {
  test('cells pad or cut to the exact width', () => {
    expect(cell('abc', 5)).toBe('abc  ');
    expect(cell('abc', 5, 'right')).toBe('  abc');
    expect(cell('abcdefgh', 5)).toBe('abcd…');
    expect([...cell('✓ passed', 10)]).toHaveLength(10);
  });

  test('hints that do not fit are dropped, help is always kept', () => {
    const hints = [
      ['↑↓', 'move'],
      ['Enter', 'open'],
      ['n', 'new board'],
      ['?', 'help'],
    ] as const;
    expect(fitHints(hints, 200).map(([k]) => k)).toEqual(['↑↓', 'Enter', 'n', '?']);
    // "↑↓ move  Enter open  ? help" is 27 columns.
    expect(fitHints(hints, 27).map(([k]) => k)).toEqual(['↑↓', 'Enter', '?']);
    expect(fitHints(hints, 26).map(([k]) => k)).toEqual(['↑↓', '?']);
    expect(fitHints(hints, 6).map(([k]) => k)).toEqual(['?']);
  });
});
