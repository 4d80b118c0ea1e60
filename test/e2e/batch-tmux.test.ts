import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { tmuxSession } from '../helpers/tmux-session.js';

// The batch screen opened at once on an empty targets cache, in a real terminal:
// the bands are computed off the UI thread, so the screen shows progress and
// answers ? and Esc meanwhile; then the bench screen's filter takes a pasted
// "/CAL", and at 90 columns the plan and date columns stay apart.

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const term = tmuxSession('probebook-e2e-batch');
const { keys, screen } = term;
let dir = '';

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'probebook-e2e-batch-'));
});

afterAll(async () => {
  term.kill();
  await rm(dir, { recursive: true, force: true });
});

describe('batch screen on an empty targets cache, in a real terminal', () => {
  test('b at once: progress, ? and Esc answered, figures on the next visit; a pasted /CAL filters', async () => {
    const command = `cd '${repo}' && CI=false PROBEBOOK_DEMO_LOG='${join(dir, 'log')}' PROBEBOOK_CACHE='${join(dir, 'cache')}' npm start; echo "probebook exited $?"; sleep 60`;
    term.start(command);
    await screen(/probebook · bench · \d+ boards[\s\S]*EXB-0101/, 150_000);

    keys('b');
    let frame = await screen(/computing the targets of [\w-]+… \d+ %/);
    expect(frame).toContain('Esc leaves');
    keys('?');
    await screen('Help — batch screen');
    keys('Escape');
    await screen(/computing the targets of|weakest first/);
    keys('Escape');
    await screen(/probebook · bench · \d+ boards/);

    // The computation went on meanwhile (and is kept): the next visit ends with the figures.
    keys('b');
    frame = await screen('[Histogram]', 120_000);
    expect(frame).toMatch(/weakest first\s+n\s+pass/);
    keys('Escape');
    await screen(/probebook · bench · \d+ boards/);

    // "/CAL" arriving as one chunk (a paste): the filter holds all of it.
    term.tmux('send-keys', '-t', term.name, '-l', '/CAL');
    frame = await screen('filter: CAL');
    expect(frame).toMatch(/bench · 2 of \d+ boards/);
    keys('Enter');

    term.resize(90, 24);
    frame = await screen(/calibrator-demo +\d{4}-\d\d-\d\d/);
    expect(frame).not.toMatch(/calibrator-demo\d/);

    keys('q');
    frame = await screen('probebook exited 0');
    expect(frame).not.toContain('Error');
  }, 300_000);
});
