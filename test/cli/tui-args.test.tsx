import { spawnSync } from 'node:child_process';
import { describe, expect, test } from 'vitest';
import { UsageError } from '../../src/cli/errors.js';
import { notTerminalMessage, operatorFrom, parseTuiArgs } from '../../src/cli/tui.js';
import { isColorOn, tone, toneProps } from '../../src/ui/theme.js';

describe('bench screen options', () => {
  test('--plan repeats and takes comma lists, in order', () => {
    const args = parseTuiArgs(['--plan', 'a.plan.json', '--plan=b.plan.json,c.plan.json', '--log', '/tmp/x', '--operator', 'kim']);
    expect(args.plans).toEqual(['a.plan.json', 'b.plan.json', 'c.plan.json']);
    expect(args.log).toBe('/tmp/x');
    expect(args.operator).toBe('kim');
    expect(args.isHelp).toBe(false);
  });

  test('unknown options, missing values and stray words are usage errors naming the problem', () => {
    expect(() => parseTuiArgs(['--colour'])).toThrow(UsageError);
    expect(() => parseTuiArgs(['--colour'])).toThrow(/unknown option --colour/);
    expect(() => parseTuiArgs(['--plan'])).toThrow(/--plan needs a value/);
    expect(() => parseTuiArgs(['--log='])).toThrow(/--log needs a value/);
    expect(() => parseTuiArgs(['board.plan.json'])).toThrow(/unexpected argument "board.plan.json"/);
  });

  test('a flag is never taken as a value, and only --plan repeats (issue 10, items 3 and 4)', () => {
    expect(() => parseTuiArgs(['--operator', '--log', '/tmp/x'])).toThrow(/--operator needs a value, but "--log" looks like an option/);
    expect(() => parseTuiArgs(['--log', '--plan', 'a.plan.json'])).toThrow(UsageError);
    expect(() => parseTuiArgs(['--log', '/tmp/a', '--log=/tmp/b'])).toThrow(/--log is given twice/);
    expect(() => parseTuiArgs(['--operator', 'kim', '--operator', 'lee'])).toThrow(/--operator is given twice/);
  });

  test('operator: flag, then PROBEBOOK_OPERATOR, then USER, then unknown', () => {
    expect(operatorFrom('ann', { PROBEBOOK_OPERATOR: 'bo', USER: 'cy' })).toBe('ann');
    expect(operatorFrom(undefined, { PROBEBOOK_OPERATOR: 'bo', USER: 'cy' })).toBe('bo');
    expect(operatorFrom(undefined, { USER: 'cy' })).toBe('cy');
    expect(operatorFrom(undefined, {})).toBe('unknown');
  });
});

describe('NO_COLOR', () => {
  // https://no-color.org: colour is off when NO_COLOR is present and not empty.
  test('turns every tone off', () => {
    expect(isColorOn({ NO_COLOR: '1' })).toBe(false);
    expect(tone('bad', { NO_COLOR: '1' })).toBeUndefined();
    expect(toneProps('good', { NO_COLOR: 'yes' })).toEqual({});
    expect(isColorOn({})).toBe(true);
    expect(isColorOn({ NO_COLOR: '' })).toBe(true);
    expect(tone('bad', {})).toBe('red');
  });
});

describe('without a terminal', () => {
  test('the bench screen says so in one line, points to the commands and exits 2', () => {
    // stdin from /dev/null is not a TTY, as in a script or a CI job.
    const r = spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/bin.ts', '--log', '/tmp/probebook-not-a-tty'], {
      input: '',
      encoding: 'utf8',
      timeout: 60_000,
    });
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(notTerminalMessage);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('targets|record|history|batch|report');
    expect(r.stdout).toBe('');
  });
});
