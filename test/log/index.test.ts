import { appendFileSync, existsSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import { journalLimitBytes } from '../../src/log/index-store.js';
import { type LogStore, openLog } from '../../src/log/store.js';
import { reading, runStart, tempDir } from './fixtures/temp-log.js';

let cleanup: (() => void)[] = [];
afterEach(() => {
  for (const c of cleanup) c();
  cleanup = [];
});

/** A log with `boards` boards, each with a run and two readings of check `a.dc` and one of `b.dc`. */
async function seededLog(boards: number): Promise<LogStore> {
  const t = tempDir('index');
  cleanup.push(t.remove);
  const log = await openLog(t.dir);
  for (let i = 0; i < boards; i++) {
    const serial = `IX-${String(i).padStart(3, '0')}`;
    const run = await log.startRun(serial, runStart);
    await log.appendReading(serial, reading(run.id, 'a.dc', 1 + i / 100, { verdict: 'fail' }));
    await log.appendReading(serial, reading(run.id, 'a.dc', 2 + i / 100));
    await log.appendReading(serial, reading(run.id, 'b.dc', 3));
  }
  return log;
}

describe('the index', () => {
  test('summarises each board: counts, state, first and latest reading per check', async () => {
    const log = await seededLog(3);
    const index = await log.readIndex();
    expect(Object.keys(index.boards).sort()).toEqual(['IX-000', 'IX-001', 'IX-002']);
    const one = index.boards['IX-001'];
    expect(one).toMatchObject({ serial: 'IX-001', plan: 'store-test', state: 'in-progress', runs: 1, readings: 3, rework: 0 });
    expect(one?.checks['a.dc']).toMatchObject({ count: 2, first: { value: 1.01, verdict: 'fail' }, latest: { value: 2.01, verdict: 'pass' } });
    expect(one?.checks['b.dc']?.count).toBe(1);
  });

  test('deleting index.json and the journal loses nothing: the next read rebuilds, with progress', async () => {
    const log = await seededLog(5);
    const before = await log.readIndex();
    rmSync(join(log.dir, 'index.json'), { force: true });
    rmSync(join(log.dir, 'index.journal'), { force: true });
    const progress: [number, number][] = [];
    const after = await log.readIndex((done, total) => progress.push([done, total]));
    expect(after).toEqual(before);
    expect(progress[0]).toEqual([0, 5]);
    expect(progress.at(-1)).toEqual([5, 5]);
    expect(existsSync(join(log.dir, 'index.json'))).toBe(true);
  });

  test('a board changed behind the index (restored from .bak by copy and rename) is read again', async () => {
    const log = await seededLog(2);
    await log.readIndex();
    const path = log.boardPath('IX-000');
    writeFileSync(`${path}.restored`, readFileSync(`${path}.bak`));
    renameSync(`${path}.restored`, path);
    const index = await log.readIndex();
    expect(index.boards['IX-000']?.readings).toBe(2);
  });

  test('a board file copied in from another log is picked up', async () => {
    const log = await seededLog(1);
    await log.readIndex();
    const text = readFileSync(log.boardPath('IX-000'), 'utf8').replaceAll('"IX-000"', '"IX-NEW"');
    writeFileSync(log.boardPath('IX-NEW'), text);
    expect((await log.readIndex()).boards['IX-NEW']?.readings).toBe(3);
  });

  test('a writer killed between its board write and its journal line: the open intent sends the reader to that board', async () => {
    const log = await seededLog(2);
    await log.readIndex();
    const run = (await log.readBoard('IX-000'))?.runs[0]?.id ?? '';
    await log.appendReading('IX-000', reading(run, 'late.dc', 7));
    const journal = join(log.dir, 'index.journal');
    // Keep the intent, drop the line that closes it (the writer died right after its rename).
    const lines = readFileSync(journal, 'utf8').trim().split('\n');
    expect(JSON.parse(lines[0] ?? '{}')).toHaveProperty('intent');
    writeFileSync(journal, `${lines[0]}\n`);
    // Another board's write afterwards accounts for the folder's latest change,
    // so only the open intent can tell the reader that IX-000 changed.
    const other = (await log.readBoard('IX-001'))?.runs[0]?.id ?? '';
    await log.appendReading('IX-001', reading(other, 'x.dc', 1));
    const index = await log.readIndex();
    expect(index.boards['IX-000']?.readings).toBe(4);
    expect(index.boards['IX-000']?.checks['late.dc']?.latest.value).toBe(7);
  });

  test('a lost journal line (a crash between board write and journal append) is repaired by the stamp check', async () => {
    const log = await seededLog(2);
    await log.readIndex();
    const journal = join(log.dir, 'index.journal');
    const board = await log.readBoard('IX-001');
    const run = board?.runs[0]?.id ?? '';
    await log.appendReading('IX-001', reading(run, 'c.dc', 4));
    writeFileSync(journal, ''); // the line never reached the disk
    appendFileSync(journal, '{"serial":"IX-001","stamp":"torn'); // and a torn line
    const index = await log.readIndex();
    expect(index.boards['IX-001']?.readings).toBe(4);
    expect(index.boards['IX-001']?.checks['c.dc']?.latest.value).toBe(4);
  });

  test('appends do not rewrite index.json; a reader replays the journal', async () => {
    const log = await seededLog(3);
    await log.readIndex();
    const snapshot = join(log.dir, 'index.json');
    const stamp = statSync(snapshot).mtimeMs;
    const text = readFileSync(snapshot, 'utf8');
    const run = (await log.readBoard('IX-002'))?.runs[0]?.id ?? '';
    for (let i = 0; i < 5; i++) await log.appendReading('IX-002', reading(run, `d${i}.dc`, i));
    expect(readFileSync(snapshot, 'utf8')).toBe(text);
    expect(statSync(snapshot).mtimeMs).toBe(stamp);
    const written = readFileSync(join(log.dir, 'index.journal'), 'utf8')
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    expect(written.filter((l) => 'intent' in l)).toHaveLength(5);
    expect(written.filter((l) => 'stamp' in l)).toHaveLength(5);
    const other = await openLog(log.dir);
    expect((await other.readIndex()).boards['IX-002']?.readings).toBe(8);
  });

  test('a long journal is compacted into index.json', async () => {
    const log = await seededLog(1);
    await log.readIndex();
    const journal = join(log.dir, 'index.journal');
    writeFileSync(journal, `${'\n'.repeat(journalLimitBytes + 10)}`);
    await log.readIndex();
    expect(existsSync(journal)).toBe(false);
    expect((await log.readIndex()).boards['IX-000']?.readings).toBe(3);
  });

  test('a damaged index.json is a cache: rebuilt, never refused', async () => {
    const log = await seededLog(2);
    writeFileSync(join(log.dir, 'index.json'), '{"schemaVersion":1,"boards":{');
    rmSync(join(log.dir, 'index.journal'), { force: true });
    const index = await log.readIndex();
    expect(Object.keys(index.boards)).toHaveLength(2);
  });

  test('a deleted board leaves the index; temporary files an hour old are swept, fresh ones kept', async () => {
    const log = await seededLog(2);
    await log.readIndex();
    rmSync(log.boardPath('IX-001'));
    const oldTmp = join(log.dir, 'boards', 'IX-000.json.999999-0badf00d.tmp');
    const newTmp = join(log.dir, 'boards', 'IX-000.json.999998-0badf00d.tmp');
    writeFileSync(oldTmp, '{');
    writeFileSync(newTmp, '{');
    const hourAgo = (Date.now() - 2 * 3600_000) / 1000;
    utimesSync(oldTmp, hourAgo, hourAgo);
    const index = await log.readIndex();
    expect(Object.keys(index.boards)).toEqual(['IX-000']);
    expect(existsSync(oldTmp)).toBe(false);
    expect(existsSync(newTmp)).toBe(true);
  });

  test('a gap in the journal chain (a middle line lost) makes the reader read that board again', async () => {
    const log = await seededLog(1);
    await log.readIndex();
    const run = (await log.readBoard('IX-000'))?.runs[0]?.id ?? '';
    await log.appendReading('IX-000', reading(run, 'gap.dc', 5));
    await log.appendReading('IX-000', reading(run, 'after.dc', 6));
    const journal = join(log.dir, 'index.journal');
    const lines = readFileSync(journal, 'utf8').trim().split('\n');
    const notes = lines.filter((l) => !l.includes('"intent"'));
    expect(notes).toHaveLength(2);
    // The second line's stamp matches the board file; only its `prev` shows the first is missing.
    writeFileSync(journal, `${lines.filter((l) => l !== notes[0]).join('\n')}\n`);
    const index = await log.readIndex();
    expect(index.boards['IX-000']?.readings).toBe(5);
    expect(index.boards['IX-000']?.checks['gap.dc']?.latest.value).toBe(5);
    expect(index.boards['IX-000']?.checks['after.dc']?.latest.value).toBe(6);
  });

  test('per-check summaries live apart from index.json and are right without their file', async () => {
    const log = await seededLog(3);
    const before = JSON.parse(JSON.stringify(await log.readIndex()));
    const snapshot = JSON.parse(readFileSync(join(log.dir, 'index.json'), 'utf8'));
    expect(snapshot.boards.rows['IX-000']).toHaveLength(8); // packed counts and state, no checks
    expect(JSON.stringify(snapshot)).not.toContain('a.dc');
    const checksFiles = readdirSync(log.dir).filter((n) => n.startsWith('index-checks.'));
    expect(checksFiles).toEqual([snapshot.checksFile]);
    rmSync(join(log.dir, snapshot.checksFile));
    const after = JSON.parse(JSON.stringify(await openLog(log.dir).then((l) => l.readIndex())));
    expect(after).toEqual(before);
  });
});
