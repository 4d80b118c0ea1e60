import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { shortCautions } from '../../src/ui/bring-up/cautions.js';
import { bringUpSuite, type tempLog } from './bring-up-harness.js';
import { keys } from './keys.js';

const suite = bringUpSuite();
const setup = suite.setup;

/** Every check of the fixture at its nominal value (the to-ground checks open), saved straight into the log. */
async function fillRun(tmp: Awaited<ReturnType<typeof tempLog>>, serial: string, skipLast = 0): Promise<string> {
  const { fixture } = suite;
  const run = await tmp.log.startRun(serial, { plan: fixture.plan.plan, planHash: fixture.plan.hash, planText: fixture.plan.text, operator: 'tester' });
  const all = fixture.targets.targets;
  for (const t of all.slice(0, all.length - skipLast)) {
    const value = t.phase === 'unpowered' ? Infinity : t.phase === 'first-power' ? t.worst.max / 2 : t.nominal;
    await tmp.log.appendReading(serial, {
      run: run.id,
      check: t.check,
      value,
      unit: t.unit,
      raw: String(value),
      operator: 'tester',
      verdict: 'pass',
      planHash: fixture.plan.hash,
    });
  }
  return run.id;
}

describe('bring-up screen: list, capture, end of run', () => {
  test('on a small terminal every caution is still shown whole, in its short form', async () => {
    const { open } = await setup();
    const s = await open({ width: 60, height: 16 });
    const frame = await s.until('Cautions before first power');
    const lines = frame.split('\n');
    expect(lines.length).toBeLessThanOrEqual(16);
    for (const line of lines) expect([...line].length).toBeLessThanOrEqual(60);
    const text = frame.replace(/[║╔╗╚╝═]/g, ' ').replace(/\s+/g, ' ');
    for (const c of shortCautions) expect(text).toContain(c);
  });

  test('Tab to the stage list; a locked check says why; j/k and Enter pick an open one', async () => {
    const { open } = await setup();
    const s = await open();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.until('rails.+9V.to-ground ›');
    await s.press(keys.tab, 'j', 'j', 'j', keys.enter);
    expect(await s.until('is locked')).toMatch(/rails\.\+9V\.dc is locked: unpowered checks first/);
    await s.press('k', 'k', keys.enter);
    expect(await s.until('rails.-9V.to-ground ›')).toContain('how: power off');
    // On an open check the attach box opens, and Esc closes it (`until` lets its key handler attach after the frame).
    await s.press('a');
    await s.until('Attach a capture');
    await s.press(keys.escape);
    await s.until('rails.-9V.to-ground ›');
  });

  test('keys that arrive in one chunk in the stage list each move the cursor', async () => {
    const { open } = await setup();
    const s = await open();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.until('rails.+9V.to-ground ›');
    // One write of `jjj`, as a multiplexer or a busy event loop delivers it: three steps down, as in the test above.
    await s.press(keys.tab, 'jjj', keys.enter);
    expect(await s.until('is locked')).toMatch(/rails\.\+9V\.dc is locked: unpowered checks first/);
    await s.press('kk', keys.enter);
    expect(await s.until('rails.-9V.to-ground ›')).toContain('how: power off');
  });

  test('a capture becomes readings of the checks at its test point, linked to the saved file', async () => {
    const { tmp, open } = await setup();
    const serial = 'FX-CAP';
    const run = await fillRun(tmp, serial, 9);
    const s = await open({ serial, resumeRun: run });
    await s.until('resumed run');
    await s.press(keys.enter);
    await s.until('osc.freq ›');
    // An invented square at the fixture's nominal frequency: ±7.8 V, 1 MHz sampling, 4 periods.
    const f = suite.fixture.targets.targets.find((t) => t.check === 'osc.freq')?.nominal ?? 0;
    const rows = ['time,ch1'];
    const n = Math.round((4 / f) * 1e6);
    for (let i = 0; i < n; i++) rows.push(`${(i * 1e-6).toExponential(6)},${(i * 1e-6 * f) % 1 < 0.5 ? 7.8 : -7.8}`);
    const file = join(tmp.dir, 'square.csv');
    await writeFile(file, `${rows.join('\n')}\n`);
    await s.press('a');
    await s.until('expecting a square');
    await s.type(file);
    await s.until('square.csv');
    await s.press(keys.enter);
    await s.until(/Enter\s+attach/, 15000);
    await s.press(keys.enter);
    const done = await s.until('saved from square.csv');
    expect(done).toMatch(/osc\.freq pass/);
    const board = await s.board();
    const fromCapture = board?.readings.filter((r) => r.capture !== undefined) ?? [];
    expect(fromCapture.map((r) => r.check).sort()).toEqual(['osc.duty', 'osc.freq', 'osc.square.vpp']);
    expect(board?.captures).toHaveLength(1);
    expect(fromCapture.every((r) => r.capture === board?.captures[0]?.file)).toBe(true);
    // Frequency of a square with exactly these periods (1 MHz sampling), to 0.1 %.
    expect(Math.abs((fromCapture.find((r) => r.check === 'osc.freq')?.value ?? 0) / f - 1)).toBeLessThan(1e-3);
  });

  test('a rework note naming no part of the plan is refused with the reason; Esc cancels; nothing is saved', async () => {
    const { open } = await setup();
    const s = await open();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.read('OL');
    await s.press('r');
    await s.until('Rework note');
    await s.type('U7');
    await s.press(keys.enter, keys.enter);
    await s.type('new one');
    await s.press(keys.enter, keys.enter);
    expect(await s.until('part must be')).toMatch(/part must be <stage>\.<part>, e\.g\. rails\.\+9V; stages: osc, shape, rails/);
    expect(s.dirty.at(-1)).toBe(true);
    await s.press(keys.escape);
    await s.until(() => !s.frame().includes('Rework note'));
    expect((await s.board())?.rework).toEqual([]);
  });

  test('once every check reads, the run can end as passed and the log says so', async () => {
    const { tmp, open } = await setup();
    const serial = 'FX-END';
    const run = await fillRun(tmp, serial);
    const s = await open({ serial, resumeRun: run });
    await s.until('resumed run');
    await s.press(keys.enter);
    await s.until('e ends the run');
    await s.press('e');
    expect(await s.until('every check has a reading')).toMatch(/› passed/);
    await s.press(keys.enter);
    await s.until('run ended: passed');
    expect((await s.board())?.runs[0]).toMatchObject({ id: run, outcome: 'passed' });
  });

  test('a run with open checks can only end failed or aborted', async () => {
    const { open } = await setup();
    const s = await open();
    await s.until('Cautions before first power');
    await s.press(keys.enter);
    await s.read('OL');
    await s.press('e');
    const offer = await s.until('checks still open');
    expect(offer).not.toMatch(/passed/);
    await s.press('j', keys.enter);
    await s.until('run ended: aborted');
    expect((await s.board())?.runs[0]?.outcome).toBe('aborted');
  });
});
