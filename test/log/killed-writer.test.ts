import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { openLog } from '../../src/log/store.js';
import { seeded, startWriter } from './fixtures/child-runner.js';

const dir = mkdtempSync(join(tmpdir(), 'probebook-kill-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('a writer killed with SIGKILL at random moments', () => {
  test('loses no acknowledged reading and leaves every file readable (24 kills, seed 20261201)', async () => {
    const random = seeded(20261201);
    const acknowledged: string[] = [];
    const kills = 24;
    for (let round = 0; round < kills; round++) {
      const writer = startWriter(dir, 'KILL-01', `w${round}`, 100_000);
      await writer.firstAck;
      // Kill anywhere from right after the first append to ~40 appends later.
      await new Promise((resolve) => setTimeout(resolve, Math.floor(random() * 120)));
      writer.child.kill('SIGKILL');
      const end = await writer.exited;
      expect(end.signal, end.stderr).toBe('SIGKILL');
      acknowledged.push(...writer.acks);
    }
    expect(acknowledged.length).toBeGreaterThanOrEqual(kills);

    // A final writer finishes normally: stale locks left by the killed ones were taken over.
    const last = startWriter(dir, 'KILL-01', 'final', 5);
    const end = await last.exited;
    expect(end.code, end.stderr).toBe(0);
    acknowledged.push(...last.acks);

    const log = await openLog(dir);
    const board = await log.readBoard('KILL-01');
    expect(board).not.toBeNull();
    const ids = new Set(board?.readings.map((r) => r.id));
    expect(ids.size).toBe(board?.readings.length);
    const missing = acknowledged.filter((id) => !ids.has(id));
    expect(missing).toEqual([]);

    // Every file in the log parses: board, backup, plan snapshot, index.
    const boardsDir = join(dir, 'boards');
    for (const name of readdirSync(boardsDir).filter((n) => n.endsWith('.json') || n.endsWith('.json.bak'))) {
      expect(() => JSON.parse(readFileSync(join(boardsDir, name), 'utf8')), name).not.toThrow();
    }
    const index = await log.readIndex();
    expect(index.boards['KILL-01']?.readings).toBe(board?.readings.length);
    expect(index.damaged).toBeUndefined();
    // Temporary files of killed writers are never mistaken for boards.
    expect(Object.keys(index.boards)).toEqual(['KILL-01']);
  });
});
