import { afterAll, describe, expect, test } from 'vitest';
import { LogInputError } from '../../src/log/errors.js';
import { openStore } from '../../src/log/open-store.js';
import type { LogStore } from '../../src/log/store.js';
import { freshDatabase } from '../helpers/pg-database.js';
import { startWriter } from './fixtures/child-runner.js';
import { planHash, planText, reading, runStart, tempDir } from './fixtures/temp-log.js';

/**
 * One contract, two stores (DESIGN §6): every promise of the log is checked
 * the same way on the folder (lowdb) and on PostgreSQL.
 */
const cleanups: (() => unknown)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

interface Kind {
  readonly name: string;
  /** A new, empty log; its location (folder or URL). */
  make(tag: string): Promise<string>;
}

const kinds: Kind[] = [
  {
    name: 'folder',
    make: async (tag) => {
      const t = tempDir(tag);
      cleanups.push(t.remove);
      return t.dir;
    },
  },
  {
    name: 'postgres',
    make: async (tag) => {
      const db = await freshDatabase(tag);
      cleanups.push(db.drop);
      return db.url;
    },
  },
];

async function open(location: string): Promise<LogStore> {
  const log = await openStore(location);
  cleanups.push(() => log.close());
  return log;
}

describe.each(kinds)('the $name store', (kind) => {
  test('a reading round-trips with every field; a second opening sees it; +∞ and the instrument survive', async () => {
    const where = await kind.make('roundtrip');
    const log = await open(where);
    const run = await log.startRun('SN-001', runStart);
    expect(run).toMatchObject({ ended: null, outcome: 'in-progress', operator: 'ann', plan: 'store-test', planHash });
    const saved = await log.appendReading('SN-001', reading(run.id, 'rails.+12V.dc', 11.93, { raw: '11,93', warnings: ['a note'] }));
    const ol = await log.appendReading(
      'SN-001',
      reading(run.id, 'rails.+12V.to-ground', Infinity, { unit: 'Ω', raw: 'OL', instrument: { name: 'dmm', identity: 'Invented,1,2,3' } }),
    );
    const other = await open(where);
    const board = await other.readBoard('SN-001');
    expect(board?.readings).toEqual([saved, ol]);
    expect(board?.readings[1]?.value).toBe(Infinity);
    expect(board?.plan).toBe('store-test');
    expect(await other.readPlanSnapshot(planHash)).toBe(planText);
    expect(await other.readBoard('SN-NONE')).toBeNull();
  });

  test('run rules: one open run per board, a new start aborts the open one, an end is idempotent and never changed', async () => {
    const log = await open(await kind.make('runs'));
    const a = await log.appendToOpenRun('B-1', runStart, { check: 'x.a', value: 1, unit: 'V', raw: '1', operator: 'ann', verdict: 'pass', planHash });
    const b = await log.appendToOpenRun('B-1', runStart, { check: 'x.b', value: 2, unit: 'V', raw: '2', operator: 'ann', verdict: 'fail', planHash });
    expect(a.startedRun).toBe(true);
    expect(b.startedRun).toBe(false);
    expect(b.run.id).toBe(a.run.id);
    const second = await log.startRun('B-1', runStart);
    const board = await log.readBoard('B-1');
    expect(board?.runs.map((r) => r.outcome)).toEqual(['aborted', 'in-progress']);
    await log.endRun('B-1', second.id, 'passed');
    await expect(log.endRun('B-1', second.id, 'passed')).resolves.toMatchObject({ outcome: 'passed' });
    await expect(log.endRun('B-1', second.id, 'failed')).rejects.toThrow(LogInputError);
    await expect(log.appendReading('B-1', reading('u-none', 'x.c', 1))).rejects.toThrow(/has no run u-none/);
  });

  test('rework notes and captures: saved by content, linked once, read back', async () => {
    const log = await open(await kind.make('rework'));
    const run = await log.startRun('B-2', runStart);
    const note = await log.addRework('B-2', { run: run.id, part: 'osc.Ct', from: '22n', to: '10n', note: 'wrong reel', operator: 'ann' });
    const bytes = new TextEncoder().encode('t,v\n0,1\n1,2\n');
    const { file } = await log.saveCapture(bytes, 'scope.csv');
    expect(file).toMatch(/^[0-9a-f]{64}\.csv$/);
    await log.linkCapture('B-2', { file, name: 'scope.csv', at: '2026-12-01T10:00:00.000Z', check: 'osc.freq', run: run.id });
    await log.linkCapture('B-2', { file, name: 'scope.csv', at: '2026-12-01T10:00:00.000Z', check: 'osc.freq', run: run.id });
    const board = await log.readBoard('B-2');
    expect(board?.rework).toEqual([note]);
    expect(board?.captures).toHaveLength(1);
    expect(Array.from((await log.readCapture(file)) ?? [])).toEqual(Array.from(bytes));
    await expect(log.linkCapture('B-2', { file: `${'0'.repeat(64)}.csv`, name: 'x', at: '2026-12-01T10:00:00.000Z', check: null, run: null })).rejects.toThrow(
      /not in the log/,
    );
  });

  test('the index: state, counts and the first and latest reading of each check', async () => {
    const log = await open(await kind.make('index'));
    const run = await log.startRun('B-3', runStart);
    await log.appendReading('B-3', reading(run.id, 'a.v', 1, { verdict: 'fail' }));
    await log.appendReading('B-3', reading(run.id, 'a.v', 1.5));
    await log.appendReading('B-3', reading(run.id, 'b.v', 2));
    await log.endRun('B-3', run.id, 'passed');
    const index = await log.readIndex();
    const b = index.boards['B-3'];
    expect(b).toMatchObject({ serial: 'B-3', plan: 'store-test', planHash, state: 'passed', runs: 1, readings: 3, rework: 0 });
    expect(b?.checks['a.v']).toMatchObject({ first: { value: 1, verdict: 'fail' }, latest: { value: 1.5, verdict: 'pass' }, count: 2 });
    await log.addRework('B-3', { run: null, part: 'a.R1', from: '1k', to: '1k2', note: '', operator: 'ann' });
    expect((await log.readIndex()).boards['B-3']?.state).toBe('reworked');
  });

  test('concurrent writers: 4 processes × 25 readings on one board lose and duplicate nothing, in one run', async () => {
    const where = await kind.make('concurrent');
    const writers = ['p0', 'p1', 'p2', 'p3'].map((tag) => startWriter(where, 'CONC-1', tag, 25));
    const ends = await Promise.all(writers.map((w) => w.exited));
    for (const e of ends) expect(e.code, e.stderr).toBe(0);
    const log = await open(where);
    const board = await log.readBoard('CONC-1');
    const acked = writers.flatMap((w) => w.acks);
    expect(acked).toHaveLength(100);
    expect(new Set(board?.readings.map((r) => r.id))).toEqual(new Set(acked));
    expect(board?.readings).toHaveLength(100);
    expect(board?.runs).toHaveLength(1);
    expect((await log.readIndex()).boards['CONC-1']?.readings).toBe(100);
  }, 120_000);

  test('a writer killed with SIGKILL at random moments loses no acknowledged reading (8 kills)', async () => {
    const where = await kind.make('killed');
    const acknowledged: string[] = [];
    for (let round = 0; round < 8; round++) {
      const writer = startWriter(where, 'KILL-1', `k${round}`, 100_000);
      await writer.firstAck;
      await new Promise((resolve) => setTimeout(resolve, 10 + ((round * 37) % 90)));
      writer.child.kill('SIGKILL');
      await writer.exited;
      acknowledged.push(...writer.acks);
    }
    const log = await open(where);
    const board = await log.readBoard('KILL-1');
    const ids = new Set(board?.readings.map((r) => r.id));
    expect(ids.size).toBe(board?.readings.length);
    expect(acknowledged.filter((id) => !ids.has(id))).toEqual([]);
    expect((await log.readIndex()).boards['KILL-1']?.readings).toBe(board?.readings.length);
  }, 120_000);
});
