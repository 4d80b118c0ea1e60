import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { openLog } from '../../src/log/store.js';
import { startWriter } from './fixtures/child-runner.js';

const dir = mkdtempSync(join(tmpdir(), 'probebook-conc-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('concurrent writers on one board', () => {
  test('4 processes × 100 readings: all 400 kept, none twice, one run', async () => {
    const writers = ['a', 'b', 'c', 'd'].map((tag) => startWriter(dir, 'CONC-01', tag, 100));
    // A second terminal watching the board while they write: it always reads a whole
    // file, never sees readings vanish, and sees the others' readings as they land.
    const watcher = await openLog(dir);
    const seen: number[] = [];
    let running = true;
    void Promise.all(writers.map((w) => w.exited)).then(() => {
      running = false;
    });
    while (running) {
      const board = await watcher.readBoard('CONC-01').catch((e: unknown) => {
        throw new Error(`a reader saw a broken board file mid-write: ${String(e)}`);
      });
      seen.push(board?.readings.length ?? 0);
      await new Promise((r) => setTimeout(r, 20));
    }
    expect(seen).toEqual([...seen].sort((x, y) => x - y));
    expect(seen.some((n) => n > 0 && n < 400)).toBe(true);
    const ends = await Promise.all(writers.map((w) => w.exited));
    for (const end of ends) expect(end.code, end.stderr).toBe(0);

    const log = await openLog(dir);
    const board = await log.readBoard('CONC-01');
    const readings = board?.readings ?? [];
    expect(readings).toHaveLength(400);
    expect(new Set(readings.map((r) => r.id)).size).toBe(400);
    expect(new Set(readings.map((r) => r.check)).size).toBe(400);
    for (const w of writers) expect(w.acks).toHaveLength(100);
    const acked = new Set(writers.flatMap((w) => w.acks));
    expect(readings.every((r) => acked.has(r.id))).toBe(true);
    // Each writer's own readings stay in the order it wrote them.
    for (const tag of ['a', 'b', 'c', 'd']) {
      const mine = readings.filter((r) => r.operator === tag).map((r) => Number(r.check.split('.n')[1]));
      expect(mine).toEqual([...mine].sort((x, y) => x - y));
    }
    // The run is started once, under the lock, although four writers found no open run.
    expect(board?.runs).toHaveLength(1);
    const index = await log.readIndex();
    expect(index.boards['CONC-01']?.readings).toBe(400);
  });

  test('in one process, 101 appends at once are all kept', async () => {
    const log = await openLog(dir);
    const { createHash } = await import('node:crypto');
    const planText = '{"plan":"in-process"}';
    const planHash = createHash('sha256').update(planText).digest('hex');
    const run = await log.startRun('CONC-02', { plan: 'in-process', planHash, planText, operator: 'ann' });
    await Promise.all(
      Array.from({ length: 101 }, (_, i) =>
        log.appendReading('CONC-02', { run: run.id, check: `p.n${i}`, value: i, unit: 'V', raw: String(i), operator: 'ann', verdict: 'pass', planHash }),
      ),
    );
    const board = await log.readBoard('CONC-02');
    expect(new Set(board?.readings.map((r) => r.check)).size).toBe(101);
  });
});
