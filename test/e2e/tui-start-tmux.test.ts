import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openLog } from '../../src/log/store.js';
import { loadPlanText } from '../../src/plan/load.js';
import { fixturePlanText, seedBoard } from '../ui/render-app.js';

// The bench screen starts before its plans are loaded (issue 15); in a real
// terminal (tmux, 80×24) it must still list the boards with the key line, and a
// bad --plan must still end the command with one line on stderr and exit 2.

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const tag = `probebook-start-${process.pid}-${Date.now().toString(36)}`;
const sessions: string[] = [];
let dir = '';

function tmux(...args: string[]): string {
  const r = spawnSync('tmux', args, { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`tmux ${args.join(' ')} failed: ${r.stderr}`);
  return r.stdout;
}

async function screen(session: string, expected: string | RegExp, timeoutMs = 30_000): Promise<string> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const text = tmux('capture-pane', '-p', '-t', session);
    if (typeof expected === 'string' ? text.includes(expected) : expected.test(text)) return text;
    if (Date.now() > until) throw new Error(`the terminal never showed ${String(expected)}; it shows:\n${text}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** probebook from source in a new 80×24 tmux window; the shell says how it exited. */
function start(name: string, args: string): string {
  const session = `${tag}-${name}`;
  sessions.push(session);
  const command = `cd '${repo}' && CI=false node --import tsx src/cli/bin.ts ${args} 2>'${dir}/${name}.err'; echo "probebook exited $?"; sleep 60`;
  tmux('new-session', '-d', '-s', session, '-x', '80', '-y', '24', command);
  return session;
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'probebook-start-'));
  const log = await openLog(join(dir, 'log'));
  const plan = loadPlanText(fixturePlanText, 'fixture.plan.json');
  await writeFile(join(dir, 'fixture.plan.json'), fixturePlanText);
  for (let i = 1; i <= 30; i++) await seedBoard(log, plan, `ST-${String(i).padStart(4, '0')}`, [], 'passed');
  await log.readIndex();
  // An invented plan with a part value that is not a resistance.
  await writeFile(join(dir, 'bad.plan.json'), fixturePlanText.replace('"10k 1%"', '"10q 1%"'));
}, 120_000);

afterAll(async () => {
  for (const s of sessions) spawnSync('tmux', ['kill-session', '-t', s]);
  await rm(dir, { recursive: true, force: true });
});

describe('the bench screen in a real terminal', () => {
  test('lists the latest boards with the key line in 24 rows, opens a board once the plans are in, and quits', async () => {
    const session = start('good', `--log '${dir}/log' --plan '${dir}/fixture.plan.json'`);
    let frame = await screen(session, /› ST-0030[\s\S]*ST-0029/);
    expect(frame).toContain('probebook · bench');
    expect(frame).toContain('? help');
    expect(frame.split('\n').length).toBeLessThanOrEqual(25);
    tmux('send-keys', '-t', session, 'Enter');
    frame = await screen(session, 'Start a new run on ST-0030');
    expect(frame).toContain('ui-fixture');
    tmux('send-keys', '-t', session, 'Escape');
    tmux('send-keys', '-t', session, 'q');
    frame = await screen(session, 'probebook exited 0');
    expect(frame).not.toContain('ST-0030'); // the shell's screen is back
  }, 90_000);

  test('a bad --plan closes the screen and says what is wrong in one line, exit 2; a missing one before the screen opens', async () => {
    const session = start('bad', `--log '${dir}/log' --plan '${dir}/bad.plan.json'`);
    await screen(session, 'probebook exited 2');
    // The terminal's cursor is shown again on exit (an escape sequence, not text); the message is one line.
    const text = (name: string) => readFileSync(join(dir, `${name}.err`), 'utf8').replaceAll(/\u001B\[\?25[hl]/g, '');
    expect(text('bad').trim().split('\n')).toHaveLength(1);
    expect(text('bad')).toMatch(/^probebook: plan .*bad\.plan\.json, stages\[0\]\.parts\.R1: "10q 1%" is not a resistance/);

    const missing = start('missing', `--log '${dir}/log' --plan '${dir}/no-such.plan.json'`);
    const frame = await screen(missing, 'probebook exited 2');
    expect(frame).not.toContain('probebook · bench');
    expect(readFileSync(join(dir, 'missing.err'), 'utf8')).toMatch(
      /^probebook: plan .*no-such\.plan\.json: no such file; give the path of a \*\.plan\.json file\n$/,
    );
  }, 90_000);
});
