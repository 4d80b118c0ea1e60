import { readFileSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openLog } from '../../src/log/store.js';
import { markdownText, oneLine, terminalSafe } from '../../src/units/text.js';
import { biasPlan, cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

// Issue 10, item 17: operator names, titles and ids reach the terminal and the
// reports as plain text, never as escape sequences, forged lines or HTML.
const t = tempDir('escaping');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'tess' };
const esc = '\u001b';
// Control characters a terminal acts on: C0 but line feed, DEL, C1 (U+009B is a one-character CSI).
const terminalControls = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/;

beforeAll(async () => {
  // A log written before the fix (or by hand) can hold anything: put it there through the store.
  const log = await openLog(t.dir);
  const planText = readFileSync(biasPlan, 'utf8');
  const planHash = createHash('sha256').update(planText).digest('hex');
  const forged = `eve\n2026-01-01 00:00:00    PASS     ref.out.dc = 3.3 V${esc}[2J${esc}]0;owned\u0007\u009b31m`;
  await log.appendToOpenRun(
    'OLD-1',
    { plan: 'bias-ref-a', planHash, planText, operator: forged },
    { check: 'ref.out.dc', value: 3.4, unit: 'V', raw: `3.4${esc}[31m`, operator: forged, verdict: 'fail', planHash },
  );
  await log.addRework('OLD-1', {
    run: null,
    part: 'ref.Rtop',
    from: '6k2',
    to: '6k8',
    note: `<script>alert(1)</script> | \`code\` ${esc}[5m`,
    operator: forged,
  });
});

describe('operator names are cleaned on the way in', () => {
  test('a newline and an escape sequence in --operator are not saved', async () => {
    const r = await cli(
      ['record', '--plan', biasPlan, '--board', 'OP-1', '--check', 'ref.out.dc', '--value', '3.28', '--operator', `kim${esc}[31m\nPASS forged`, '--json'],
      env,
    );
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).reading.operator).toBe('kim[31m PASS forged');
  });

  test('an operator longer than 64 characters is refused (exit 2), nothing saved', async () => {
    const r = await cli(['record', '--plan', biasPlan, '--board', 'OP-2', '--check', 'ref.out.dc', '--value', '3.28', '--operator', 'x'.repeat(65)], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('at most 64 characters');
    const h = await cli(['history', 'OP-2'], env);
    expect(h.status).toBe(2);
  });
});

describe('what a log holds is escaped on the way out', () => {
  test('history: one line per event, no control character reaches the terminal', async () => {
    const r = await cli(['history', 'OLD-1'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).not.toMatch(terminalControls);
    // One run, one reading, one rework note: a forged line would show as a fourth event.
    const events = r.stdout.split('\n').filter((l) => /^\d{4}-\d\d-\d\d \d\d:\d\d:\d\d {2}/.test(l));
    expect(events, r.stdout).toHaveLength(3);
    expect(events.filter((l) => /\bPASS\b/.test(l.slice(21, 30)))).toEqual([]);
  });

  test('history --json keeps the stored text exactly, as valid JSON with escapes', async () => {
    const r = await cli(['history', 'OLD-1', '--json'], env);
    expect(r.status).toBe(0);
    expect(r.stdout).not.toMatch(/[\u001b\u009b\u0007]/);
    const data = JSON.parse(r.stdout) as { readings: { operator: string; raw: string }[] };
    expect(data.readings[0]?.operator).toContain(`${esc}[2J`);
    expect(data.readings[0]?.raw).toBe(`3.4${esc}[31m`);
  });

  test('the Markdown report passes no HTML, no forged table cell, no escape sequence', async () => {
    const r = await cli(['report', 'OLD-1', '--format', 'md'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).not.toContain('<script>');
    expect(r.stdout).toContain('&lt;script&gt;');
    expect(r.stdout).not.toMatch(terminalControls);
    // Every row of the rework table has exactly its 7 cells (8 unescaped pipes).
    const row = r.stdout.split('\n').find((l) => l.includes('ref.Rtop'));
    expect(row?.replace(/\\\|/g, '').split('|')).toHaveLength(9);
  });
});

describe('plan titles and ids', () => {
  const plan = JSON.parse(readFileSync(biasPlan, 'utf8')) as Record<string, unknown> & { rails: Record<string, unknown>[] };
  const write = (name: string, data: unknown) => {
    const file = join(t.dir, name);
    writeFileSync(file, JSON.stringify(data));
    return file;
  };

  test('a title with an escape sequence is shown without it', async () => {
    const file = write('title.plan.json', { ...plan, title: `Bias ${esc}[2Jboard\nline two` });
    const r = await cli(['targets', file, '--trials', '100'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).not.toMatch(terminalControls);
    expect(r.stdout).toContain('Bias [2Jboard line two');
  });

  test('a title over 200 characters is a plan error naming the key', async () => {
    const r = await cli(['targets', write('long-title.plan.json', { ...plan, title: 't'.repeat(201) })], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/title: a title is at most 200 characters/);
  });

  test('a rail id with a control character is a plan error', async () => {
    const rails = [{ ...plan.rails[0], id: `+10V${esc}[31m` }, plan.rails[1]];
    const r = await cli(['targets', write('rail-id.plan.json', { ...plan, rails })], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/rails\[0\]\.id: holds a control character/);
    expect(r.stderr).not.toMatch(terminalControls);
  });
});

describe('the text helpers', () => {
  test('oneLine, terminalSafe, markdownText', () => {
    expect(oneLine(' a\tb\r\nc\u0000d\u202ee ')).toBe('a b cde');
    expect(terminalSafe(`a${esc}[31mb\n`)).toBe('a\\u001b[31mb\n');
    expect(JSON.parse(terminalSafe(JSON.stringify('x\u009by')))).toBe('x\u009by');
    expect(markdownText('a|b <i>`c`</i> *d*')).toBe('a\\|b &lt;i&gt;\\`c\\`&lt;/i&gt; \\*d\\*');
  });
});
