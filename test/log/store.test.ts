import { existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import { LogInputError } from '../../src/log/errors.js';
import { openLog } from '../../src/log/store.js';
import { planHash, planText, reading, runStart, tempDir } from './fixtures/temp-log.js';

let cleanup: (() => void)[] = [];
afterEach(() => {
  for (const c of cleanup) c();
  cleanup = [];
});
function fresh() {
  const t = tempDir('store');
  cleanup.push(t.remove);
  return t.dir;
}

describe('openLog', () => {
  test('makes the folder layout of DESIGN §6 on first open', async () => {
    const dir = fresh();
    const log = await openLog(join(dir, 'new', 'log'));
    for (const sub of ['boards', 'plans', 'captures']) expect(existsSync(join(log.dir, sub))).toBe(true);
  });

  test('refuses a file in place of the folder, with a message naming it', async () => {
    const dir = fresh();
    writeFileSync(join(dir, 'file'), 'x');
    await expect(openLog(join(dir, 'file'))).rejects.toThrow(/log folder .*file .*--log DIR/);
  });
});

describe('runs, readings and rework', () => {
  test('a reading round-trips through the disk with id, run, time, operator, raw text, value, unit, verdict and plan hash', async () => {
    const dir = fresh();
    const log = await openLog(dir);
    const run = await log.startRun('SN-001', runStart);
    expect(run).toMatchObject({ ended: null, outcome: 'in-progress', operator: 'ann', plan: 'store-test', planHash });
    const saved = await log.appendReading('SN-001', reading(run.id, 'rails.+12V.dc', 11.93, { raw: '11,93' }));
    expect(saved.id).toMatch(/^r-[0-9a-z]{9}-[0-9a-z]{8}$/);
    // The id letters are fixed: logs written before keep theirs (reading r-, run u-).
    expect(run.id).toMatch(/^u-[0-9a-z]{9}-[0-9a-z]{8}$/);
    expect(Date.parse(saved.at)).not.toBeNaN();
    // A second, independent opening of the folder (as a second terminal would) sees it.
    const other = await openLog(dir);
    const board = await other.readBoard('SN-001');
    expect(board?.readings).toEqual([saved]);
    expect(board?.readings[0]).toMatchObject({
      run: run.id,
      check: 'rails.+12V.dc',
      value: 11.93,
      unit: 'V',
      raw: '11,93',
      operator: 'ann',
      verdict: 'pass',
      planHash,
    });
    expect(board?.plan).toBe('store-test');
  });

  test('an open circuit (+Infinity) survives JSON', async () => {
    const log = await openLog(fresh());
    const run = await log.startRun('SN-OL', runStart);
    await log.appendReading('SN-OL', reading(run.id, 'rails.+12V.to-ground', Infinity, { unit: 'Ω', raw: 'OL' }));
    const board = await log.readBoard('SN-OL');
    expect(board?.readings[0]?.value).toBe(Infinity);
    expect(readFileSync(log.boardPath('SN-OL'), 'utf8')).toContain('"value": "Infinity"');
  });

  test('the exact plan text is kept by its hash', async () => {
    const log = await openLog(fresh());
    await log.startRun('SN-002', runStart);
    expect(await log.readPlanSnapshot(planHash)).toBe(planText);
    expect(await log.readPlanSnapshot('0'.repeat(64))).toBeNull();
    await expect(log.readPlanSnapshot('../boards/x')).rejects.toThrow(/not a sha256/);
  });

  test('a run ends once; starting a new run aborts the open one', async () => {
    const log = await openLog(fresh());
    const first = await log.startRun('SN-003', runStart);
    const second = await log.startRun('SN-003', runStart);
    let board = await log.readBoard('SN-003');
    expect(board?.runs.map((r) => r.outcome)).toEqual(['aborted', 'in-progress']);
    expect(board?.runs[0]?.ended).not.toBeNull();
    const ended = await log.endRun('SN-003', second.id, 'passed');
    expect(ended.outcome).toBe('passed');
    expect(await log.endRun('SN-003', second.id, 'passed')).toEqual(ended);
    await expect(log.endRun('SN-003', second.id, 'failed')).rejects.toThrow(/already ended passed/);
    await expect(log.endRun('SN-003', 'u-nope', 'failed')).rejects.toThrow(LogInputError);
    await expect(log.endRun('SN-003', first.id, 'in-progress')).rejects.toThrow(/cannot end as in-progress/);
    board = await log.readBoard('SN-003');
    expect(board?.runs[1]?.ended).toBe(ended.ended);
  });

  test('a reading into an ended run is kept, with a warning', async () => {
    const log = await openLog(fresh());
    const run = await log.startRun('SN-004', runStart);
    await log.endRun('SN-004', run.id, 'failed');
    const saved = await log.appendReading('SN-004', reading(run.id, 'x.dc', 1));
    expect(saved.warnings?.[0]).toMatch(/after its run .* ended/);
  });

  test('appendToOpenRun starts a run only when none is open', async () => {
    const log = await openLog(fresh());
    const a = await log.appendToOpenRun('SN-005', runStart, reading('', 'a', 1));
    const b = await log.appendToOpenRun('SN-005', runStart, reading('', 'b', 2));
    expect(a.startedRun).toBe(true);
    expect(b.startedRun).toBe(false);
    expect(b.run.id).toBe(a.run.id);
    await log.endRun('SN-005', a.run.id, 'failed');
    const c = await log.appendToOpenRun('SN-005', runStart, reading('', 'c', 3));
    expect(c.startedRun).toBe(true);
    expect(c.board.runs).toHaveLength(2);
  });

  test('rework notes keep part, from, to, note, time and operator', async () => {
    const log = await openLog(fresh());
    const run = await log.startRun('SN-006', runStart);
    const note = await log.addRework('SN-006', { run: run.id, part: 'tap.Rbottom', from: '4k7', to: '4k3', note: 'wrong value fitted', operator: 'bo' });
    expect(note.id).toMatch(/^w-/);
    const board = await log.readBoard('SN-006');
    expect(board?.rework).toEqual([note]);
    await expect(log.addRework('SN-006', { run: 'u-none', part: 'x', from: '', to: '', note: '', operator: '' })).rejects.toThrow(/no run/);
  });

  test('captures are kept by content hash and linked to a board', async () => {
    const log = await openLog(fresh());
    const bytes = new TextEncoder().encode('t,v\n0,0\n1e-6,0.5\n');
    const { file } = await log.saveCapture(bytes, 'scope 1.CSV');
    expect(file).toMatch(/^[0-9a-f]{64}\.csv$/);
    expect(readFileSync(join(log.dir, 'captures', file), 'utf8')).toBe('t,v\n0,0\n1e-6,0.5\n');
    expect((await log.saveCapture(bytes, 'again.csv')).file).toBe(file);
    const ref = { file, name: 'scope 1.CSV', at: new Date().toISOString(), check: 'osc.freq', run: null };
    await log.linkCapture('SN-007', ref);
    await log.linkCapture('SN-007', ref);
    expect((await log.readBoard('SN-007'))?.captures).toEqual([ref]);
    await expect(log.linkCapture('SN-007', { ...ref, file: `${'1'.repeat(64)}.csv` })).rejects.toThrow(/not in the log/);
  });

  test('refuses bad serials, unknown runs, NaN values and unknown plans; writes nothing', async () => {
    const log = await openLog(fresh());
    await expect(log.startRun('a..b', runStart)).rejects.toThrow(/contains "\.\."/);
    await expect(log.readBoard('a/b')).rejects.toThrow(/path separator/);
    const run = await log.startRun('SN-008', runStart);
    const before = readFileSync(log.boardPath('SN-008'), 'utf8');
    await expect(log.appendReading('SN-008', reading('u-missing', 'a', 1))).rejects.toThrow(/no run u-missing/);
    await expect(log.appendReading('SN-008', reading(run.id, 'a', Number.NaN))).rejects.toThrow(/not a number/);
    await expect(log.appendReading('SN-008', reading(run.id, 'a', 1, { planHash: 'f'.repeat(64) }))).rejects.toThrow(/not in the log/);
    await expect(log.startRun('SN-008', { ...runStart, planHash: 'e'.repeat(64) })).rejects.toThrow(/not the sha256/);
    expect(readFileSync(log.boardPath('SN-008'), 'utf8')).toBe(before);
  });

  test('the previous version of a board file is kept as .bak', async () => {
    const log = await openLog(fresh());
    const run = await log.startRun('SN-009', runStart);
    await log.appendReading('SN-009', reading(run.id, 'a', 1));
    const previous = readFileSync(log.boardPath('SN-009'), 'utf8');
    await log.appendReading('SN-009', reading(run.id, 'b', 2));
    expect(readFileSync(`${log.boardPath('SN-009')}.bak`, 'utf8')).toBe(previous);
  });

  test('serials that differ only in case never mix (as on a case-blind file system)', async () => {
    const log = await openLog(fresh());
    await log.startRun('SN-A', runStart);
    // Simulate a case-blind file system: the file for sn-a is the one SN-A wrote.
    writeFileSync(log.boardPath('sn-a'), readFileSync(log.boardPath('SN-A')));
    await expect(log.readBoard('sn-a')).rejects.toThrow(/holds board "SN-A", not "sn-a"/);
    await expect(log.startRun('sn-a', runStart)).rejects.toThrow(/holds board/);
    rmSync(log.boardPath('sn-a'));
  });
});
