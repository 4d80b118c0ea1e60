import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openLog } from '../../src/log/store.js';
import { biasPlan, cli, cliProcess } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

const t = tempDir('history');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'tess' };

beforeAll(async () => {
  for (const [check, value] of [
    ['rails.+10V.to-ground', 'OL'],
    ['rails.-10V.to-ground', '4k7'],
    ['rails.idle-current', '16 mA'],
    ['ref.out.dc', '3.41'],
  ] as const) {
    const r = await cli(['record', '--plan', biasPlan, '--board', 'H-001', '--check', check, '--value', value], env);
    expect(r.status, r.stderr).toBe(0);
  }
  const log = await openLog(t.dir);
  const board = await log.readBoard('H-001');
  await log.addRework('H-001', {
    run: board?.runs[0]?.id ?? null,
    part: 'ref.Rbottom',
    from: '3k6',
    to: '3k3',
    note: 'wrong value fitted (invented)',
    operator: 'kim',
  });
});

describe('probebook history', () => {
  test('--json prints the contract keys for runs, readings and rework', async () => {
    const r = await cli(['history', 'H-001', '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.serial).toBe('H-001');
    expect(out.runs).toHaveLength(1);
    for (const key of ['id', 'started', 'ended', 'operator', 'outcome']) expect(out.runs[0]).toHaveProperty(key);
    expect(out.readings.map((x: { check: string }) => x.check)).toEqual(['rails.+10V.to-ground', 'rails.-10V.to-ground', 'rails.idle-current', 'ref.out.dc']);
    expect(Object.keys(out.readings[0])).toEqual(['id', 'run', 'check', 'value', 'unit', 'raw', 'at', 'operator', 'verdict']);
    expect(out.readings[1]).toMatchObject({ value: 4700, unit: 'Ω', raw: '4k7', verdict: 'pass' });
    expect(out.readings[3].verdict).toBe('fail');
    expect(out.rework).toEqual([
      { at: expect.any(String), part: 'ref.Rbottom', from: '3k6', to: '3k3', note: 'wrong value fitted (invented)', operator: 'kim', run: out.runs[0].id },
    ]);
  });

  test('readable: a header with counts and a timeline with every reading, its band and the rework note', async () => {
    const r = await cli(['history', 'H-001'], env);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^board H-001 · plan bias-ref-a · 1 run · 4 readings \(3 pass, 0 marginal, 1 fail\) · 1 rework note/);
    expect(r.stdout).toContain('rails.+10V.to-ground = +∞ (typed "OL", tess); band at least 100 Ω');
    expect(r.stdout).toMatch(/FAIL +ref\.out\.dc = 3\.41 V .*band 3\.159 V … 3\.378 V, \+4\.37 %/);
    expect(r.stdout).toMatch(/rework ref\.Rbottom: 3k6 → 3k3 — wrong value fitted \(invented\) \(kim\)/);
    const lines = r.stdout.split('\n');
    expect(lines.findIndex((l) => l.includes('started by tess'))).toBeLessThan(lines.findIndex((l) => l.includes('ref.out.dc')));
  });

  test('an unknown board: exit 2, "no board SERIAL in LOG", close serials offered (real process)', () => {
    const r = cliProcess(['history', 'H-01'], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`probebook: no board H-01 in ${t.dir}; close ones: H-001\n`);
  });

  test('a bad serial: exit 2 before anything is read', async () => {
    const r = await cli(['history', '../etc/passwd'], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/path separator/);
  });

  test('--log DIR wins over PROBEBOOK_LOG', async () => {
    const other = tempDir('history-other');
    await openLog(other.dir);
    try {
      const r = await cli(['history', 'H-001', '--log', other.dir], env);
      expect(r.status).toBe(2);
      expect(r.stderr).toContain(`no board H-001 in ${other.dir}; the log has no boards yet`);
    } finally {
      other.remove();
    }
  });
});

describe('commands that only read never create a log (issue 10 item 8)', () => {
  test.each([
    ['history', ['history', 'H-001']],
    ['report SERIAL', ['report', 'H-001', '--format', 'md']],
    ['report --batch', ['report', '--batch', '--format', 'csv']],
    ['batch', ['batch']],
  ])('%s on a mistyped --log: exit 2, one line, no folder made', async (_name, argv) => {
    const parent = tempDir('history-typo');
    try {
      const typo = `${parent.dir}/lgo`;
      const r = await cli([...argv, '--log', typo], env);
      expect(r.status).toBe(2);
      expect(r.stderr).toBe(`probebook: there is no log at ${typo}; check --log (or $PROBEBOOK_LOG), or record a reading first\n`);
      expect(existsSync(typo)).toBe(false);
    } finally {
      parent.remove();
    }
  });

  test('an existing folder that is no log is refused and left as it was', async () => {
    const other = tempDir('history-notalog');
    try {
      const r = await cli(['history', 'H-001', '--log', other.dir], env);
      expect(r.status).toBe(2);
      expect(r.stderr).toBe(`probebook: ${other.dir} is not a probebook log (it has no boards folder); check --log (or $PROBEBOOK_LOG)\n`);
      expect(readdirSync(other.dir)).toEqual([]);
    } finally {
      other.remove();
    }
  });
});

describe('--log and --cache on the command line (issue 10 items 7 and 9)', () => {
  test.each([
    [['history', 'H-001', '--log', '']],
    [['history', 'H-001', '--log=']],
    [['record', '--plan', biasPlan, '--board', 'H-002', '--check', 'ref.out.dc', '--value', '3.4', '--log=']],
    [['batch', '--log', '']],
    [['report', 'H-001', '--log=']],
    [['targets', biasPlan, '--log=']],
    [['analyze', 'demo/captures/exciter-sine.csv', '--log=']],
  ])('an empty --log is refused with one line: %j', async (argv) => {
    const r = await cli(argv, env);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('probebook: --log needs a folder (or a PostgreSQL URL); leave it out to use $PROBEBOOK_LOG or the data folder\n');
  });

  test('the bench screen refuses an empty --log too, in one line, before it needs a terminal', async () => {
    const r = await cli(['--log='], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^probebook: --log needs a value; usage: probebook \[--log DIR\][^\n]*\n$/);
  });

  test('history and report keep their targets in --cache DIR, not in PROBEBOOK_CACHE; an edited entry is recomputed and said once', async () => {
    const mine = tempDir('history-cache');
    const envCache = tempDir('history-envcache');
    try {
      const first = await cli(['history', 'H-001', '--cache', mine.dir], { ...env, PROBEBOOK_CACHE: envCache.dir });
      expect(first.status, first.stderr).toBe(0);
      const files = readdirSync(mine.dir).filter((n) => n.endsWith('.json'));
      expect(files).toHaveLength(1);
      expect(readdirSync(envCache.dir)).toEqual([]);
      // Someone edits the cached band of ref.out.dc: the report must not believe it.
      const file = join(mine.dir, files[0] ?? '');
      const text = readFileSync(file, 'utf8');
      writeFileSync(file, text.replace(/("check":"ref\.out\.dc"[^}]*?"worst":\{"min":)([-\d.e]+)/, '$1-100'));
      expect(readFileSync(file, 'utf8')).not.toBe(text);
      const report = await cli(['report', 'H-001', '--format', 'csv', '--cache', mine.dir], env);
      expect(report.status).toBe(0);
      expect(report.stderr.match(/does not match its own checksum/g)).toHaveLength(1);
      expect(report.stdout).not.toContain('-100');
      const quiet = await cli(['report', 'H-001', '--format', 'csv', '--cache', mine.dir], env);
      expect(quiet.stderr).toBe('');
      expect(quiet.stdout).toBe(report.stdout);
    } finally {
      mine.remove();
      envCache.remove();
    }
  });

  test('--help of every command that computes targets says where the cache lives, even with --log', async () => {
    for (const argv of [
      ['targets', '--help'],
      ['record', '--help'],
      ['history', '--help'],
      ['batch', '--help'],
      ['report', '--help'],
      ['report', '--batch', '--help'],
      ['--help'],
    ]) {
      const r = await cli(argv, env);
      expect(r.status, argv.join(' ')).toBe(0);
      expect(r.stdout, argv.join(' ')).toMatch(/--cache DIR/);
      expect(r.stdout, argv.join(' ')).toMatch(/even when --log is given/);
    }
  });
});
