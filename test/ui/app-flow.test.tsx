import { readdir } from 'node:fs/promises';
import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import type { BenchLog } from '../../src/log/types.js';
import { keys } from './keys.js';
import { loadPlanText } from '../../src/plan/load.js';
import { fixturePlan, type RenderedApp, renderApp } from './render-app.js';

let app: RenderedApp | undefined;
afterEach(async () => {
  await app?.cleanup();
  app = undefined;
});

/** Start a run on a board the way the bring-up screen does, with readings already taken. */
async function boardWithReadings(
  a: { readonly log: BenchLog },
  serial: string,
  plan: RenderedApp['plans'][number],
  readings: [check: string, value: number, raw: string][],
) {
  const run = await a.log.startRun(serial, { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator: 'earlier' });
  for (const [check, value, raw] of readings) {
    await a.log.appendReading(serial, { run: run.id, check, value, unit: 'Ω', raw, operator: 'earlier', verdict: 'pass', planHash: plan.hash });
  }
  return run;
}

describe('bench → new board → bring-up', () => {
  test('a bad serial is refused with the reason and nothing is written; a good one opens a run and a reading is saved', async () => {
    app = await renderApp();
    await app.waitFor('No boards in this log yet');
    await app.press('n');
    await app.type('FX/01');
    await app.waitFor('path separator');
    await app.press(keys.enter);
    expect(app.frame()).toContain('New board');
    expect(await readdir(join(app.dir, 'boards'))).toEqual([]);

    await app.press(keys.backspace, keys.backspace, keys.backspace);
    await app.type('-0001');
    expect(app.frame()).toContain('serial: FX-0001');
    expect(app.frame()).not.toContain('path separator');
    await app.press(keys.enter);
    // One plan given: the run opens straight away, cautions first (DESIGN §9).
    await app.waitFor('Cautions before first power');
    expect(app.frame()).toContain('probebook · bring-up · FX-0001 · ui-fixture');
    await app.press(keys.enter);
    await app.waitFor('rails.+12V.to-ground');
    await app.type('15k');
    await app.press(keys.enter);
    await app.waitFor('saved');
    expect(app.frame()).toMatch(/PASS/i);

    const board = await app.log.readBoard('FX-0001');
    expect(board?.readings).toHaveLength(1);
    expect(board?.readings[0]).toMatchObject({ check: 'rails.+12V.to-ground', raw: '15k', value: 15_000, unit: 'Ω', verdict: 'pass', operator: 'tester' });

    await app.press(keys.escape);
    await app.waitFor('probebook · bench · 1 board');
    expect(app.frame()).toMatch(/FX-0001\s+ui-fixture.*▶ in progress/);
  });

  test('an existing serial is selected instead of made twice', async () => {
    app = await renderApp({
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        await boardWithReadings({ log }, 'FX-0007', plan, []);
        await boardWithReadings({ log }, 'FX-0008', plan, []);
      },
    });
    await app.waitFor('FX-0008');
    await app.press('n');
    await app.type('FX-0007');
    await app.press(keys.enter);
    await app.waitFor('FX-0007 is already in the log');
    expect(app.frame()).toMatch(/› FX-0007/);
  });

  test('with two plans the technician chooses one for the new board', async () => {
    const second = { ...fixturePlan, plan: 'ui-fixture-b', title: 'Second invented board' };
    app = await renderApp({ planTexts: [JSON.stringify(fixturePlan), JSON.stringify(second)] });
    await app.waitFor('No boards');
    await app.press('n');
    await app.type('FXB-0001');
    await app.press(keys.enter);
    await app.waitFor('Plan for FXB-0001');
    expect(app.frame()).toContain('ui-fixture (fixture-0.plan.json, 0 boards) — UI test board (invented)');
    expect(app.frame()).toContain('ui-fixture-b (fixture-1.plan.json, 0 boards) — Second invented board');
    await app.press(keys.down, keys.enter);
    await app.waitFor('probebook · bring-up · FXB-0001 · ui-fixture-b');
  });
});

describe('plans kept in the log', () => {
  test('a plan only the log holds (an older board’s snapshot) is offered for a new board and opens', async () => {
    const older = { ...fixturePlan, plan: 'ui-fixture-rev0', title: 'Earlier revision (invented)' };
    app = await renderApp({
      setup: async (log) => {
        const plan = loadPlanText(JSON.stringify(older), 'older.plan.json');
        await boardWithReadings({ log }, 'OLD-0001', plan, []);
      },
    });
    await app.waitFor('OLD-0001');
    await app.press('n');
    await app.type('NEW-0001');
    await app.press(keys.enter);
    const frame = await app.waitFor('Plan for NEW-0001');
    expect(frame).toContain('ui-fixture (fixture-0.plan.json, 0 boards) — UI test board (invented)');
    expect(frame).toMatch(/ui-fixture-rev0 \(log snapshot [0-9a-f]{8}, 1 board\) — Earlier revision/);
    await app.press(keys.down, keys.enter);
    await app.waitFor('probebook · bring-up · NEW-0001 · ui-fixture-rev0');
  });
});

describe('resume and new runs', () => {
  test('Enter on a board with an unfinished run resumes that run where it stopped', async () => {
    app = await renderApp({
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        await boardWithReadings({ log }, 'FX-0042', plan, [
          ['rails.+12V.to-ground', 12_000, '12k'],
          ['rails.-12V.to-ground', 11_000, '11k'],
        ]);
      },
    });
    await app.waitFor('FX-0042');
    await app.press(keys.enter);
    // 15 checks: the fixture's amplifier gained its DC level check (amp.out.dc).
    await app.waitFor('2/15 read');
    await app.press(keys.enter); // the cautions again, as the board may have been off the bench
    await app.waitFor('rails.idle-current');
    const board = await app.log.readBoard('FX-0042');
    expect(board?.runs).toHaveLength(1);
    expect(board?.readings).toHaveLength(2);
  });

  test('Enter on a finished board asks before starting a new run', async () => {
    app = await renderApp({
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        const run = await boardWithReadings({ log }, 'FX-0050', plan, [['rails.+12V.to-ground', 12_000, '12k']]);
        await log.endRun('FX-0050', run.id, 'failed');
      },
    });
    await app.waitFor(/FX-0050.*✗ failed/);
    await app.press(keys.enter);
    await app.waitFor('Start a new run on FX-0050');
    await app.press(keys.escape);
    expect(app.frame()).not.toContain('Start a new run');
    await app.press(keys.enter);
    await app.waitFor('Start a new run on FX-0050');
    await app.press(keys.enter);
    await app.waitFor('probebook · bring-up · FX-0050');
    // The bring-up screen opens the run with its first reading: no empty runs.
    await app.waitFor('Cautions before first power');
    await app.press(keys.enter);
    await app.waitFor('rails.+12V.to-ground');
    await app.type('13k');
    await app.press(keys.enter);
    await app.waitFor('saved');
    const runs = (await app.log.readBoard('FX-0050'))?.runs.length;
    expect(runs).toBe(2);
  });
});

describe('quitting', () => {
  test('q quits at once when nothing is typed', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('q');
    expect(app.quitCount()).toBe(1);
  });

  test('q in the serial field is a letter, not quit', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('n');
    await app.type('Q-1');
    expect(app.frame()).toContain('serial: Q-1');
    expect(app.quitCount()).toBe(0);
  });

  test('q with a reading half typed asks first; n stays with the text kept, y quits', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('n');
    await app.type('FX-0002');
    await app.press(keys.enter);
    await app.waitFor('Cautions before first power');
    await app.press(keys.enter);
    await app.waitFor('rails.+12V.to-ground');
    await app.type('4k');
    await app.press('q');
    await app.waitFor('Quit probebook?');
    expect(app.quitCount()).toBe(0);
    await app.press('n');
    expect(app.frame()).not.toContain('Quit probebook?');
    expect(app.frame()).toContain('4k');
    await app.press('q');
    await app.waitFor('Quit probebook?');
    await app.press('y');
    expect(app.quitCount()).toBe(1);
  });

  test('q in the rework note is a letter, not quit (and no quit dialog)', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('n');
    await app.type('FX-0003');
    await app.press(keys.enter);
    await app.waitFor('Cautions before first power');
    await app.press(keys.enter);
    await app.waitFor('rails.+12V.to-ground');
    await app.press('r');
    await app.waitFor('part');
    await app.type('q');
    expect(app.frame()).not.toContain('Quit probebook?');
    expect(app.quitCount()).toBe(0);
    await app.press(keys.escape);
    // Back on the input line, the app has the `q` again: the screen hands it back in the same key event.
    await app.waitFor('type a reading');
    await app.press('q');
    await app.waitFor(() => (app?.quitCount() ?? 0) > 0);
    expect(app.quitCount()).toBe(1);
  });
});
