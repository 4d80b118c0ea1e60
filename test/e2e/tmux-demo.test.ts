import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { tmuxSession } from '../helpers/tmux-session.js';

// The real command in a real terminal: tmux runs `npm start` in an 80×24 window,
// keys go in with send-keys, and what the technician would see comes back from
// capture-pane. No fixed sleeps: every step polls the screen until it shows.

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const term = tmuxSession('probebook-e2e');
const { capture, keys, typeText, screen } = term;
let logDir = '';

beforeAll(async () => {
  logDir = await mkdtemp(join(tmpdir(), 'probebook-e2e-'));
});

afterAll(async () => {
  term.kill();
  await rm(logDir, { recursive: true, force: true });
});

describe('npm start in a real terminal', () => {
  test('a reading typed at the bring-up screen is shown with its verdict and is in the log file', async () => {
    const demoLog = join(logDir, 'demo-log');
    // NO_COLOR set: the screen must still say everything with marks and words.
    // CI=false: Ink draws only the last frame when it thinks it runs in CI (CI set, as .ci/run has it).
    const command = `cd '${repo}' && CI=false PROBEBOOK_DEMO_LOG='${demoLog}' PROBEBOOK_OPERATOR=e2e NO_COLOR=1 npm start; echo "probebook exited $?"; sleep 60`;
    term.start(command);

    // The first start writes the invented demo log (and builds the bundle if needed).
    let frame = await screen(/probebook · bench · \d+ boards[\s\S]*EXB-0101/, 150_000);
    expect(frame).toMatch(/EXB-0106\s+exciter-demo.*✓ passed/);
    expect(frame).toMatch(/EXB-0109\s+exciter-demo.*▶ in progress/);
    expect(frame).toMatch(/EXB-0107\s+exciter-demo.*↻ reworked/);

    keys('n');
    await screen('New board');
    await typeText('E2E/1');
    await screen('path separator');
    keys('BSpace', 'BSpace');
    await screen(/serial: E2E\s/);
    await typeText('-0001');
    await screen('serial: E2E-0001');
    keys('Enter');
    frame = await screen('Plan for E2E-0001');
    expect(frame).toContain('exciter-demo');
    expect(frame).toContain('line-driver-demo');
    keys('Enter');
    await screen('Cautions before first power');
    keys('Enter');
    await screen('rails.+12V.to-ground');
    await typeText('18.2k');
    keys('Enter');
    frame = await screen('saved');
    expect(frame).toMatch(/✓ PASS/);
    expect(frame).toContain('18.2 kΩ');

    const board = JSON.parse(await readFile(join(demoLog, 'boards', 'E2E-0001.json'), 'utf8')) as {
      readings: { check: string; raw: string; value: number; verdict: string; operator: string }[];
    };
    expect(board.readings).toHaveLength(1);
    expect(board.readings[0]).toMatchObject({ check: 'rails.+12V.to-ground', raw: '18.2k', value: 18_200, verdict: 'pass', operator: 'e2e' });

    // No ANSI colour anywhere (SGR 30–37, 90–97, 38;…), as NO_COLOR asks.
    expect(capture(true)).not.toMatch(/\u001B\[(?:[\d;]*;)?(?:3[0-8]|9[0-7])(?:;[\d;]*)?m/);

    // A bigger window mid-run: the layout follows; back to 80×24.
    keys('Escape');
    await screen(/E2E-0001\s+exciter-demo.*▶ in progress/);
    term.resize(120, 30);
    frame = await screen('readings');
    expect(frame.split('\n').some((line) => line.length > 80)).toBe(true);
    term.resize(80, 24);
    await screen(/^(?![\s\S]*readings)[\s\S]*E2E-0001/);

    keys('q');
    frame = await screen('probebook exited 0');
    expect(frame).not.toContain('Error');

    // The demo's story of the wrong capacitor, as the log holds it: the frequency
    // fails about a decade low, Ct is reworked, the frequency is read again and passes.
    const ex = JSON.parse(await readFile(join(demoLog, 'boards', 'EXB-0106.json'), 'utf8')) as {
      readings: { check: string; value: number; verdict: string; at: string }[];
      rework: { part: string; at: string }[];
      runs: { outcome: string }[];
    };
    const freq = ex.readings.filter((r) => r.check === 'osc.freq');
    expect(freq.map((r) => r.verdict)).toEqual(['fail', 'pass']);
    // Sedra/Smith: the ideal period is 4·R1·R·C/R2, so ×10 on C gives a tenth of the
    // frequency; the comparator's slew time (a fixed 4·Vsat/SR per period) pulls the
    // ratio somewhat above 1/10, never below.
    const ratio = (freq[0]?.value ?? NaN) / (freq[1]?.value ?? NaN);
    expect(ratio).toBeGreaterThan(0.09);
    expect(ratio).toBeLessThan(0.2);
    expect(ex.rework.map((w) => w.part)).toEqual(['osc.Ct']);
    expect((ex.rework[0]?.at ?? '') > (freq[0]?.at ?? '')).toBe(true);
    expect((ex.rework[0]?.at ?? '') < (freq[1]?.at ?? '')).toBe(true);
    expect(ex.runs.map((r) => r.outcome)).toEqual(['passed']);
  }, 240_000);
});
