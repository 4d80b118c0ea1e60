import { readFileSync, writeFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { LogDamageError } from '../../src/log/errors.js';
import { type LogStore, openLog } from '../../src/log/store.js';
import { reading, runStart, tempDir } from './fixtures/temp-log.js';

const t = tempDir('damage');
let log: LogStore;
let good: string;
let runId: string;
beforeAll(async () => {
  log = await openLog(t.dir);
  const run = await log.startRun('GOOD', runStart);
  runId = run.id;
  await log.appendReading('GOOD', reading(run.id, 'a.dc', 1.5));
  good = readFileSync(log.boardPath('GOOD'), 'utf8');
});
afterAll(() => t.remove());

/** Write `text` as board `serial` (with `bak` as its backup, or none), then try every write on it. */
async function expectRefused(serial: string, text: string, pattern: RegExp, bak?: string): Promise<string> {
  const path = log.boardPath(serial);
  writeFileSync(path, text);
  if (bak !== undefined) writeFileSync(`${path}.bak`, bak);
  const error = await log.readBoard(serial).then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(LogDamageError);
  const message = (error as Error).message;
  expect(message).toMatch(pattern);
  expect(message).toContain(path);
  expect(message).not.toContain('\n');
  await expect(log.appendReading(serial, reading(runId, 'b.dc', 2))).rejects.toThrow(LogDamageError);
  await expect(log.startRun(serial, runStart)).rejects.toThrow(LogDamageError);
  await expect(log.addRework(serial, { run: null, part: 'x.R', from: '1k', to: '2k', note: '', operator: '' })).rejects.toThrow(LogDamageError);
  // Never overwritten: the bytes on disk are the damaged bytes.
  expect(readFileSync(path, 'utf8')).toBe(text);
  return message;
}

describe('a damaged board file is refused with one clear line and left untouched', () => {
  test('truncated JSON: says where, and how to restore from .bak', async () => {
    const cut = good.slice(0, Math.floor(good.length * 0.6));
    const message = await expectRefused('CUT', cut, /ends early at line \d+, column \d+/, good.replace('"GOOD"', '"CUT"'));
    expect(message).toMatch(/restore it with: cp '.*CUT\.json\.bak' '.*CUT\.json\.restore' && mv '.*CUT\.json\.restore' '.*CUT\.json'/);
  });

  test('a syntax error in the middle: position given', async () => {
    const broken = good.replace('"readings": [', '"readings": [,');
    const lines = broken.slice(0, broken.indexOf('[,') + 1).split('\n');
    const message = await expectRefused('SYNTAX', broken, /does not parse/);
    expect(message).toContain(`line ${lines.length}, column`);
    // No backup: it says so and offers to move the file aside.
    expect(message).toMatch(/No good backup .* missing.*mv '/);
  });

  test('wrong shape: names the JSON path', async () => {
    const data = JSON.parse(good.replace('"GOOD"', '"SHAPE"'));
    data.readings[0].value = 'twelve';
    await expectRefused('SHAPE', JSON.stringify(data), /wrong shape at readings\[0\]\.value: expected a number/);
  });

  test('a JSON array instead of a board', async () => {
    await expectRefused('ARRAY', '[1, 2, 3]', /no JSON object/);
  });

  test('a future schema version: update probebook, never downgrade the file', async () => {
    const data = JSON.parse(good.replace('"GOOD"', '"FUTURE"'));
    data.schemaVersion = 7;
    const message = await expectRefused('FUTURE', JSON.stringify(data), /newer probebook \(schema version 7; this one reads up to 1\)/);
    expect(message).toMatch(/update probebook/);
  });

  test('a missing schema version', async () => {
    const data = JSON.parse(good.replace('"GOOD"', '"NOVERSION"'));
    delete data.schemaVersion;
    await expectRefused('NOVERSION', JSON.stringify(data), /schemaVersion: missing is not a known board schema version/);
  });

  test('the index lists a damaged board instead of failing, and keeps the others', async () => {
    const index = await log.readIndex();
    expect(index.boards.GOOD?.readings).toBe(1);
    const names = (index.damaged ?? []).map((d) => d.serial).sort();
    expect(names).toEqual(['ARRAY', 'CUT', 'FUTURE', 'NOVERSION', 'SHAPE', 'SYNTAX']);
    expect(index.damaged?.find((d) => d.serial === 'CUT')?.message).toMatch(/cp '/);
  });

  test('after restoring from .bak, the board reads and takes readings again', async () => {
    const path = log.boardPath('CUT');
    writeFileSync(path, readFileSync(`${path}.bak`));
    const board = await log.readBoard('CUT');
    expect(board?.readings).toHaveLength(1);
    await log.appendReading('CUT', reading(runId, 'b.dc', 2));
    expect((await log.readIndex()).boards.CUT?.readings).toBe(2);
  });
});
