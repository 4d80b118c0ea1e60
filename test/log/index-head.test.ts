import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import { byActivity } from '../../src/log/board-order.js';
import { headRows } from '../../src/log/index-store.js';
import { type LogStore, openLog } from '../../src/log/store.js';
import { type BoardFile, boardSchemaVersion } from '../../src/log/types.js';
import { planHash, reading, runStart, tempDir } from './fixtures/temp-log.js';

// The index's first boards by latest activity, read without the rest (the bench
// screen's first frame). Whatever the head says must be what the whole index says.

let cleanup: (() => void)[] = [];
afterEach(() => {
  for (const c of cleanup) c();
  cleanup = [];
});

/** Invented board files written straight into a new log folder, each with one finished run at its own time. */
function logWithBoards(count: number): string {
  const t = tempDir('head');
  cleanup.push(t.remove);
  mkdirSync(join(t.dir, 'boards'), { recursive: true });
  for (let i = 0; i < count; i++) {
    const serial = `HD-${String(i).padStart(4, '0')}`;
    // Times out of serial order (i·37 mod count), some boards sharing a time, and every tenth board never run.
    const minute = (i * 37) % count;
    const at = new Date(Date.UTC(2026, 10, 2, 8) + Math.floor(minute / 2) * 60_000).toISOString();
    const runs = i % 10 === 9 ? [] : [{ id: `run-${i}`, started: at, ended: at, operator: 'ann', outcome: 'passed' as const, plan: 'store-test', planHash }];
    const board: BoardFile = { schemaVersion: boardSchemaVersion, serial, plan: 'store-test', runs, readings: [], rework: [], captures: [] };
    writeFileSync(join(t.dir, 'boards', `${serial}.json`), `${JSON.stringify(board)}\n`);
  }
  return t.dir;
}

/** The serials of the whole index in the bench screen's order. */
async function wholeOrder(log: LogStore): Promise<string[]> {
  return Object.values((await log.readIndex()).boards)
    .sort(byActivity)
    .map((b) => b.serial);
}

describe('the head of the index', () => {
  test('is the first boards of the whole index, in order of latest activity, and index.json stays one JSON document', async () => {
    const log = await openLog(logWithBoards(headRows + 57));
    expect(log.readIndexHead(20)).toBeNull(); // no snapshot yet: only the full read answers
    const order = await wholeOrder(log);
    const head = log.readIndexHead(20);
    expect(head?.boards.map((b) => b.serial)).toEqual(order.slice(0, 20));
    expect(head?.isWhole).toBe(false);
    // Boards without a run come last (common practice for "latest activity" lists, no source).
    expect(order.slice(-3).every((s) => Number(s.slice(3)) % 10 === 9)).toBe(true);
    // More than the snapshot keeps: it gives what it has.
    expect(log.readIndexHead(10_000)?.boards).toHaveLength(headRows);

    const text = readFileSync(join(log.dir, 'index.json'), 'utf8');
    expect(text.split('\n')[0]).toMatch(/^\{"head":/);
    const snapshot = JSON.parse(text) as { head: { total: number }; boards: { rows: Record<string, unknown> } };
    expect(snapshot.head.total).toBe(headRows + 57);
    expect(Object.keys(snapshot.boards.rows)).toHaveLength(headRows + 57);
  });

  test('has the counts and state of each board as the whole index does', async () => {
    const log = await openLog(logWithBoards(30));
    const whole = await log.readIndex();
    const head = log.readIndexHead(50);
    expect(head?.isWhole).toBe(true);
    expect(head?.boards).toHaveLength(30);
    for (const b of head?.boards ?? []) {
      const { checks: _checks, ...fromWhole } = whole.boards[b.serial] ?? { checks: {} };
      expect(b).toEqual(fromWhole);
    }
  });

  test('takes the journal on top: a board written since the snapshot is first, with its new counts', async () => {
    const log = await openLog(logWithBoards(headRows + 10));
    const order = await wholeOrder(log);
    const last = order.at(-1) ?? '';
    const run = await log.startRun(last, runStart);
    await log.appendReading(last, reading(run.id, 'a.dc', 1.5));
    await log.startRun('HD-NEW', runStart);
    const head = log.readIndexHead(5);
    expect(head?.boards.slice(0, 2).map((b) => b.serial)).toEqual(['HD-NEW', last]);
    // The last board had never been run (every tenth board has no run): now one run, open, with one reading.
    expect(head?.boards[1]).toMatchObject({ state: 'in-progress', runs: 1, readings: 1 });
    expect(head?.boards.map((b) => b.serial)).toEqual((await wholeOrder(log)).slice(0, 5));
  });

  test('a damaged or older index.json gives no head, and the next full read writes one', async () => {
    const log = await openLog(logWithBoards(12));
    await log.readIndex();
    const file = join(log.dir, 'index.json');
    const good = readFileSync(file, 'utf8');
    writeFileSync(file, good.slice(0, 40));
    expect(log.readIndexHead(5)).toBeNull();
    // A snapshot of the layout before the head: one line, no head key.
    const { head: _head, ...older } = JSON.parse(good) as Record<string, unknown>;
    writeFileSync(file, JSON.stringify(older));
    expect(log.readIndexHead(5)).toBeNull();
    const order = await wholeOrder(log);
    expect(log.readIndexHead(5)?.boards.map((b) => b.serial)).toEqual(order.slice(0, 5));
  });
});
