import { render } from 'ink-testing-library';
import { describe, expect, test } from 'vitest';
import type { BoardHead } from '../../src/log/types.js';
import { boardCells, boardColumns, boardHeader } from '../../src/ui/bench/board-columns.js';
import { BoardList } from '../../src/ui/bench/board-list.js';

// Invented boards; the plan ids and serials are ours.
const board = (serial: string, plan: string | null, state: BoardHead['state'] = 'in-progress'): BoardHead => ({
  serial,
  plan,
  planHash: null,
  state,
  lastRunAt: '2026-11-04T10:42:00.000Z',
  runs: 123,
  readings: 4567,
  rework: 89,
});

const rowText = (b: BoardHead, width: number) => {
  const c = boardCells(b, boardColumns(width));
  return `  ${c.before}${c.state}${c.after}`;
};

// A row read back as its columns: serial and plan have no spaces, then the date, the state word, the counts.
const rowPattern =
  /^ {2}(?<serial>\S+) +(?<plan>\S+) +(?:(?<when>\d{4}-\d\d-\d\d \d\d:\d\d) +)?(?<state>▶ in progress|✓ passed|✗ failed|· untouched|↻ reworked)(?: +(?<runs>\d+) +(?<readings>\d+) +(?<rework>\d+))? *$/u;

describe('bench screen board columns', () => {
  test('at every width from 60 to 200 each column is apart from the next and the row fits', () => {
    const plans = ['x', 'calibrator-demo', 'line-driver-rev-c', 'a-very-long-plan-identifier-for-a-test-rig', 'p'.repeat(80)];
    const serials = ['PB-1', 'CAL-2026-0001', 'S'.repeat(40)];
    for (let width = 60; width <= 200; width++) {
      for (const plan of plans) {
        for (const serial of serials) {
          const text = rowText(board(serial, plan), width);
          expect([...text].length, `width ${width}`).toBeLessThanOrEqual(width);
          const m = rowPattern.exec(text);
          expect(m, `width ${width}: ${JSON.stringify(text)}`).not.toBeNull();
          const g = m?.groups ?? {};
          // The plan shown is the whole id, or its start cut with an ellipsis: never run into the date.
          if (g.plan === plan) expect(plan.length).toBeLessThanOrEqual(boardColumns(width).plan);
          else {
            expect(g.plan?.endsWith('…')).toBe(true);
            expect(plan.startsWith(g.plan?.slice(0, -1) ?? '')).toBe(true);
          }
          if (g.serial !== serial) expect(g.serial?.endsWith('…')).toBe(true);
          expect(g.when !== undefined).toBe(width >= 64);
          expect(g.runs !== undefined).toBe(width >= 90);
          if (width >= 90) expect([g.runs, g.readings, g.rework]).toEqual(['123', '4567', '89']);
        }
      }
    }
  });

  test('the header names sit over their columns at every width', () => {
    for (let width = 60; width <= 200; width++) {
      const col = boardColumns(width);
      const head = boardHeader(col);
      const row = rowText(board('PB-0001', 'exciter-b'), width);
      expect([...head].length).toBeLessThanOrEqual(width);
      // Each name starts where its column starts in the row.
      expect(head.indexOf('plan')).toBe(row.indexOf('exciter-b'));
      expect(head.indexOf('state')).toBe(row.indexOf('▶ in progress'));
      if (col.when > 0) expect(head.indexOf('last run')).toBe(row.search(/\d{4}-\d\d-\d\d/));
    }
  });

  test('at 90, 100 and 120 columns the plan and the date are apart on screen', () => {
    for (const width of [90, 100, 120]) {
      const r = render(<BoardList boards={[board('CAL-0001', 'calibrator-demo')]} start={0} rows={3} selected={0} width={width} />);
      const frame = r.lastFrame() ?? '';
      expect(frame, `width ${width}`).toMatch(/calibrator-demo +\d{4}-\d\d-\d\d/);
      expect(frame).not.toMatch(/calibrator-demo\d/);
      r.unmount();
    }
  });
});
