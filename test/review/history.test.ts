import { describe, expect, test } from 'vitest';
import type { BoardFile, Reading } from '../../src/log/types.js';
import { boardHashes, historyCounts, reworkComparison, timelineOf } from '../../src/review/history.js';
import { demoBands, revA, revB } from './fixtures.js';

// An invented board: a first run that failed osc.freq, a rework, a second run.
const reading = (id: string, check: string, value: number, verdict: Reading['verdict'], at: string, planHash = revA): Reading => ({
  id,
  run: at < '2026-11-02T10' ? 'u1' : 'u2',
  check,
  value,
  unit: check.startsWith('rails') ? 'V' : 'Hz',
  raw: String(value),
  at,
  operator: 'tess',
  verdict,
  planHash,
});
const board: BoardFile = {
  schemaVersion: 1,
  serial: 'PB-0042',
  plan: 'osc-demo',
  runs: [
    { id: 'u1', started: '2026-11-02T09:00:00.000Z', ended: '2026-11-02T09:30:00.000Z', operator: 'tess', outcome: 'failed', plan: 'osc-demo', planHash: revA },
    { id: 'u2', started: '2026-11-02T11:00:00.000Z', ended: '2026-11-02T11:30:00.000Z', operator: 'tess', outcome: 'passed', plan: 'osc-demo', planHash: revB },
  ],
  readings: [
    reading('r1', 'rails.p.dc', 12.02, 'pass', '2026-11-02T09:01:00.000Z'),
    reading('r2', 'osc.freq', 25, 'fail', '2026-11-02T09:02:00.000Z'),
    reading('r3', 'osc.freq', 24, 'fail', '2026-11-02T09:03:00.000Z'),
    reading('r4', 'osc.freq', 16.2, 'pass', '2026-11-02T11:01:00.000Z', revB),
    reading('r5', 'osc.freq', 16.1, 'pass', '2026-11-02T11:02:00.000Z', revB),
  ],
  rework: [{ id: 'w1', at: '2026-11-02T10:00:00.000Z', run: null, part: 'osc.Ct', from: '8n2', to: '10n', note: 'wrong value fitted', operator: 'tess' }],
  captures: [{ file: `${'c'.repeat(64)}.csv`, name: 'scope1.csv', at: '2026-11-02T09:02:00.000Z', check: 'osc.freq', run: 'u1' }],
};

describe('board history', () => {
  test('timeline in time order, a capture before the reading made at the same instant', () => {
    const kinds = timelineOf(board, demoBands()).map((e) => `${e.kind}@${e.at.slice(11, 16)}`);
    expect(kinds).toEqual([
      'run@09:00',
      'reading@09:01',
      'capture@09:02',
      'reading@09:02',
      'reading@09:03',
      'rework@10:00',
      'run@11:00',
      'reading@11:01',
      'reading@11:02',
    ]);
  });

  test('each reading carries the target of the revision it was judged by, and its deviation', () => {
    const readings = timelineOf(board, demoBands()).filter((e) => e.kind === 'reading');
    const r2 = readings.find((e) => e.reading.id === 'r2');
    const r4 = readings.find((e) => e.reading.id === 'r4');
    expect(r2?.target?.worst).toEqual({ min: 8, max: 20 });
    expect(r4?.target?.worst).toEqual({ min: 7, max: 21 });
    // (25 − 16) / 16 = 0.5625 (abs 1e-12)
    expect(r2?.deviation).toBeCloseTo(0.5625, 12);
    // A snapshot not in the log gives no target and no deviation, not a guess.
    const alone = timelineOf(board, new Map()).find((e) => e.kind === 'reading');
    expect(alone).toMatchObject({ target: null, deviation: null });
  });

  test('limit checks (rail to ground, idle current) have no deviation from their threshold', () => {
    const run = board.runs[0];
    const limitBoard = {
      ...board,
      readings: [
        { ...(board.readings[0] as (typeof board.readings)[number]), id: 'g1', check: 'rails.+12V.to-ground', value: 14_600, unit: 'Ω' as const },
        { ...(board.readings[0] as (typeof board.readings)[number]), id: 'i1', check: 'rails.idle-current', value: 0.015, unit: 'A' as const },
      ],
      runs: run ? [run] : [],
    };
    const hash = board.readings[0]?.planHash ?? '';
    const bands = new Map([
      [
        hash,
        {
          bands: new Map([
            ['rails.+12V.to-ground', { nominal: 100, worst: { min: 100, max: Infinity }, isLimit: true }],
            ['rails.idle-current', { nominal: 0.0175, worst: { min: 0, max: 0.035 }, isLimit: true }],
          ]),
        },
      ],
    ]) as unknown as Parameters<typeof timelineOf>[1];
    const readings = timelineOf(limitBoard, bands).filter((e) => e.kind === 'reading');
    expect(readings.map((e) => (e.kind === 'reading' ? e.deviation : 'x'))).toEqual([null, null]);
  });

  test('before/after a rework: last reading before, first after; the reworked stage first', () => {
    const rows = reworkComparison(board, board.rework[0] ?? (undefined as never));
    expect(rows.map((r) => [r.check, r.before?.id ?? null, r.after?.id ?? null])).toEqual([
      ['osc.freq', 'r3', 'r4'],
      ['rails.p.dc', 'r1', null],
    ]);
  });

  test('hashes to load and header counts', () => {
    expect(boardHashes(board).sort()).toEqual([revA, revB]);
    expect(historyCounts(board)).toEqual({ runs: 2, readings: 5, pass: 3, marginal: 0, fail: 2, rework: 1 });
  });
});
