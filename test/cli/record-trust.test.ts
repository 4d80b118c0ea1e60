import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { parseArgs } from '../../src/cli/args.js';
import { UsageError } from '../../src/cli/errors.js';
import { biasPlan, cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

// Issue 10: nothing typed on the command line is saved as a value the user did not write.
const t = tempDir('record-trust');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'tess' };
const record = (board: string, value: string, extra: string[] = [], moreEnv: Record<string, string> = {}) =>
  cli(['record', '--plan', biasPlan, '--board', board, '--check', 'ref.out.dc', '--value', value, ...extra], { ...env, ...moreEnv });

/** Readings saved on a board, straight from its file. */
function saved(board: string): { value: number; raw: string; operator: string }[] {
  const file = join(t.dir, 'boards', `${board}.json`);
  if (!existsSync(file)) return [];
  return (JSON.parse(readFileSync(file, 'utf8')) as { readings: { value: number; raw: string; operator: string }[] }).readings;
}

describe('values with spaces and commas (items 1 and 2)', () => {
  test.each(['1 2', '3 28', '3\n28', '3 2 8', '3 k 3'])('%j exits 2, one line naming it, nothing saved', async (text) => {
    const r = await record('SP-1', text);
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain(JSON.stringify(text));
    expect(saved('SP-1')).toEqual([]);
  });

  test('"3,280" is ambiguous: exit 2 with "write 3.28 or 3280", nothing saved', async () => {
    const r = await record('CM-1', '3,280');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('write 3.28 or 3280');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(saved('CM-1')).toEqual([]);
  });

  test('"3,28" stays 3.28', async () => {
    const r = await record('CM-2', '3,28', ['--json']);
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).reading.value).toBe(3.28);
  });

  test('--decimal-comma or PROBEBOOK_DECIMAL_COMMA=1 reads "3,280" as 3.28', async () => {
    const flag = await record('CM-3', '3,280', ['--json', '--decimal-comma']);
    expect(flag.status, flag.stderr).toBe(0);
    expect(JSON.parse(flag.stdout).reading).toMatchObject({ value: 3.28, raw: '3,280' });
    const setting = await record('CM-3', '3,280', ['--json'], { PROBEBOOK_DECIMAL_COMMA: '1' });
    expect(setting.status, setting.stderr).toBe(0);
    expect(JSON.parse(setting.stdout).reading.value).toBe(3.28);
  });

  test('a plan with "decimalComma": true reads "3,280" as 3.28', async () => {
    const plan = JSON.parse(readFileSync(biasPlan, 'utf8')) as Record<string, unknown>;
    const file = join(t.dir, 'comma.plan.json');
    writeFileSync(file, JSON.stringify({ ...plan, decimalComma: true }));
    const r = await cli(['record', '--plan', file, '--board', 'CM-4', '--check', 'ref.out.dc', '--value', '3,280', '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).reading.value).toBe(3.28);
  });
});

describe('repeated options and values that look like flags (items 3 and 4)', () => {
  test('--value 3.28 --value 99 is refused, nothing saved', async () => {
    const r = await record('RP-1', '3.28', ['--value', '99']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--value is given twice \("3\.28" and "99"\)/);
    expect(saved('RP-1')).toEqual([]);
  });

  test('--board A --board B is refused, neither board written', async () => {
    const r = await record('RP-A', '3.28', ['--board', 'RP-B']);
    expect(r.status).toBe(2);
    expect(saved('RP-A')).toEqual([]);
    expect(saved('RP-B')).toEqual([]);
  });

  test('--json twice is refused too', async () => {
    const r = await record('RP-2', '3.28', ['--json', '--json']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--json is given twice');
  });

  test('--operator --json does not save an operator called "--json"', async () => {
    const r = await record('FL-1', '3.28', ['--operator', '--json']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('looks like an option');
    expect(saved('FL-1')).toEqual([]);
  });

  test('--log --json makes no folder "--json"', async () => {
    const before = readdirSync(process.cwd());
    const r = await cli(['record', '--plan', biasPlan, '--board', 'FL-2', '--check', 'ref.out.dc', '--value', '3.28', '--log', '--json'], env);
    expect(r.status).toBe(2);
    expect(existsSync(join(process.cwd(), '--json'))).toBe(false);
    expect(readdirSync(process.cwd())).toEqual(before);
  });

  test.each([['--value', '-3.28'], ['--value=-3.28'], ['--value', '-3.28 V']])('a negative reading is still taken as typed: %s %s', async (...words) => {
    const r = await cli(['record', '--plan', biasPlan, '--board', 'NEG-1', '--check', 'ref.out.dc', ...words.filter((w) => w !== undefined), '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).reading.value).toBe(-3.28);
  });

  test('--value --json is refused (not a negative number)', async () => {
    const r = await record('NEG-2', '--json');
    expect(r.status).toBe(2);
    expect(saved('NEG-2')).toEqual([]);
  });
});

describe('parseArgs', () => {
  const spec = { options: { value: 'string', operator: 'string', json: 'boolean' }, usage: 'x', negativeNumbers: ['value'] } as const;
  test.each([
    [['--operator', '-x']],
    [['--operator=--json']],
    [['--operator', '-1']], // a negative number only where the option takes one
    [['--value', '-']],
    [['--value', '--5']],
    [['--value', '1', '--value=1']], // even the same value twice: say it once
  ])('%j is a UsageError', (argv) => {
    expect(() => parseArgs(argv, spec)).toThrow(UsageError);
  });

  test('negative numbers pass where allowed', () => {
    expect(parseArgs(['--value', '-.5'], spec).options.value).toBe('-.5');
    expect(parseArgs(['--value=-1e3'], spec).options.value).toBe('-1e3');
  });
});
