import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { tmuxSession } from '../helpers/tmux-session.js';

// The third demo plan (the invented calibrator board) walked in a real terminal:
// tmux runs `npm start` at 80×24, a new board takes the calibrator plan, the safety
// checks and a few stage checks are typed, a wrong regulator output is diagnosed on
// the screen, and a timer check draws its expected trace. Every step polls the
// screen until it shows (no fixed sleeps).

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const term = tmuxSession('probebook-cal');
const { capture, keys, typeText, screen } = term;
let logDir = '';

/** Type a reading as a person does, send it, and wait until the screen says it was saved. */
async function reading(check: string, text: string): Promise<string> {
  await screen(new RegExp(`${check.replace(/[.+]/g, '\\$&')} ›`));
  await typeText(text);
  keys('Enter');
  return screen(new RegExp(`(PASS|FAIL|MARGINAL) ${check.replace(/[.+]/g, '\\$&')} = .* saved ✓`));
}

beforeAll(async () => {
  logDir = await mkdtemp(join(tmpdir(), 'probebook-cal-e2e-'));
});

afterAll(async () => {
  term.kill();
  await rm(logDir, { recursive: true, force: true });
});

describe('the calibrator demo in a real terminal', () => {
  test('a new calibrator board: safety checks, a wrong regulator output diagnosed, a timer trace', async () => {
    const demoLog = join(logDir, 'demo-log');
    const command = `cd '${repo}' && CI=false PROBEBOOK_DEMO_LOG='${demoLog}' PROBEBOOK_OPERATOR=e2e NO_COLOR=1 npm start; echo "probebook exited $?"; sleep 60`;
    term.start(command);
    await screen(/probebook · bench[\s\S]*CAL-0302\s+calibrator-demo/, 150_000);

    keys('n');
    await screen('New board');
    await typeText('CAL-E2E1');
    await screen('serial: CAL-E2E1');
    keys('Enter');
    await screen('Plan for CAL-E2E1');
    for (let i = 0; i < 5 && !/› calibrator-demo/.test(capture()); i++) {
      keys('Down');
      await new Promise((r) => setTimeout(r, 150));
    }
    await screen('› calibrator-demo');
    keys('Enter');
    // The cautions come first, computing the targets may take a few seconds.
    await screen('Cautions before first power', 60_000);
    keys('Enter');

    for (const [check, text] of [
      ['rails.+15V.to-ground', '12k'],
      ['rails.-15V.to-ground', '15k'],
      ['rails.idle-current', '42m'],
      ['rails.+15V.dc', '15.02'],
      ['rails.-15V.dc', '-14.97'],
    ] as const) {
      expect(await reading(check, text)).toContain('PASS');
      keys('Enter');
    }

    // 12.82 V where 10.14 V is designed: the regulator's set resistors, never its own reference.
    let frame = await reading('vpos.out.dc', '12.82');
    expect(frame).toContain('FAIL vpos.out.dc');
    frame = await screen(/1\. +\d+ % vpos\.R[12]/);
    expect(frame).not.toMatch(/vpos\.vref/);
    expect(frame).not.toMatch(/read vpos\.pdiss/);
    keys('Enter');

    for (const [check, text] of [
      ['vneg.out.dc', '-10.1'],
      ['zref.out.dc', '6.26'],
      ['zref.iz', '5.5m'],
    ] as const) {
      expect(await reading(check, text)).toContain('PASS');
      keys('Enter');
    }
    frame = await reading('tone.freq', '931');
    expect(frame).toContain('PASS tone.freq');
    // The timer output's expected trace, with its legend, inside 80×24.
    frame = await screen('· expected');
    expect(frame.split('\n').every((line) => [...line].length <= 80)).toBe(true);

    keys('Escape');
    await screen(/CAL-E2E1\s+calibrator-demo.*in progress/);
    keys('q');
    frame = await screen('probebook exited 0');
    expect(frame).not.toContain('Error');

    const board = JSON.parse(await readFile(join(demoLog, 'boards', 'CAL-E2E1.json'), 'utf8')) as {
      readings: { check: string; raw: string; value: number; verdict: string }[];
    };
    expect(board.readings.map((r) => r.check)).toEqual([
      'rails.+15V.to-ground',
      'rails.-15V.to-ground',
      'rails.idle-current',
      'rails.+15V.dc',
      'rails.-15V.dc',
      'vpos.out.dc',
      'vneg.out.dc',
      'zref.out.dc',
      'zref.iz',
      'tone.freq',
    ]);
    expect(board.readings.find((r) => r.check === 'vpos.out.dc')).toMatchObject({ raw: '12.82', value: 12.82, verdict: 'fail' });
  }, 300_000);
});
