import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import { keys } from './keys.js';
import { fixturePlan, fixturePlanText, type RenderedApp, renderApp } from './render-app.js';

let app: RenderedApp | undefined;
afterEach(async () => {
  await app?.cleanup();
  app = undefined;
});

const demoCapture = join(import.meta.dirname, '..', '..', 'demo', 'captures', 'osc-square-triangle.csv');

/** The app on the bring-up screen of a new board, past the cautions. */
async function onBringUp(serial = 'FX-0100') {
  const a = await renderApp();
  app = a;
  await a.waitFor('No boards');
  await a.press('n');
  await a.type(serial);
  await a.press(keys.enter);
  await a.waitFor('Cautions before first power');
  return a;
}

describe('every screen and dialog answers ?', () => {
  test('bench: the screen, the new-board field, the filter field', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('?');
    expect(await app.waitFor('Help — bench screen')).toContain('licensed practice');
    await app.press('?');
    await app.waitFor('No boards in this log yet');
    await app.press('n', '?');
    expect(await app.waitFor('Help — a new board (bench screen)')).toContain('Ctrl-U clears');
    await app.press(keys.escape);
    await app.waitFor('serial:');
    await app.press(keys.escape, '/', '?');
    await app.waitFor('Help — filtering the boards (bench screen)');
    await app.press('?');
    await app.waitFor('filter:');
  });

  test('bench: the start-a-run confirmation has its own help and comes back as it was', async () => {
    app = await renderApp({
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        const run = await log.startRun('FX-0050', { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator: 'earlier' });
        await log.appendReading('FX-0050', {
          run: run.id,
          check: 'rails.+12V.to-ground',
          value: 12_000,
          unit: 'Ω',
          raw: '12k',
          operator: 'earlier',
          verdict: 'pass',
          planHash: plan.hash,
        });
        await log.endRun('FX-0050', run.id, 'failed');
      },
    });
    await app.waitFor(/FX-0050.*✗ failed/);
    await app.press(keys.enter);
    await app.waitFor('Start a new run on FX-0050');
    await app.press('?');
    const help = await app.waitFor('Help — starting a run (bench screen)');
    expect(help).toContain('current-limited');
    expect(help).toContain('nothing is written to the log');
    await app.press(keys.escape);
    await app.waitFor('Start a new run on FX-0050');
    await app.press(keys.escape);
    expect(app.frame()).not.toContain('Start a new run');
  });

  test('bench: choosing a plan', async () => {
    const second = `${JSON.stringify({ ...fixturePlan, plan: 'ui-fixture-b', title: 'Second invented board' }, null, 2)}\n`;
    app = await renderApp({ planTexts: [fixturePlanText, second] });
    await app.waitFor('No boards');
    await app.press('n');
    await app.type('FX-0200');
    await app.press(keys.enter);
    await app.waitFor('Plan for FX-0200');
    await app.press('?');
    await app.waitFor('Help — choosing a plan (bench screen)');
    await app.press('?');
    await app.waitFor('Plan for FX-0200');
  });

  test('bring-up: cautions, the input line, the rework note, the end panel, the capture box, the quit dialog', async () => {
    const a = await onBringUp();
    await a.press('?');
    await a.waitFor('Help — bring-up screen');
    await a.press('?');
    await a.waitFor('Cautions before first power');
    await a.press(keys.enter);
    await a.waitFor('rails.+12V.to-ground ›');
    await a.press('?');
    await a.waitFor('Help — bring-up screen');
    await a.press(keys.escape);
    await a.waitFor('rails.+12V.to-ground ›');

    await a.press('r', '?');
    expect(await a.waitFor('Help — rework note (bring-up screen)')).toContain('discharge');
    await a.press('?');
    await a.waitFor('Rework note');
    await a.press(keys.escape);

    await a.press('e', '?');
    await a.waitFor('Help — ending the run (bring-up screen)');
    await a.press(keys.escape);
    expect(a.frame()).not.toContain('Help —');
    await a.press(keys.escape);

    await a.press('a');
    await a.waitFor('Attach a capture');
    await a.press('?');
    await a.waitFor('Help — attaching a capture (capture screen)');
    await a.press('?');
    await a.waitFor('Attach a capture');
    await a.press(keys.escape);

    await a.type('12');
    await a.press('q');
    await a.waitFor('Quit probebook?');
    await a.press('?');
    expect(await a.waitFor('Help — quitting')).toContain('stay there');
    await a.press('n');
    expect(a.frame()).toContain('rails.+12V.to-ground › 12');
    expect(a.quitCount()).toBe(0);
  });

  test('bring-up: the power-off stop', async () => {
    const a = await onBringUp();
    await a.press(keys.enter);
    // Both rails open to ground, then an idle current far above the 30 mA limit.
    for (const [check, value] of [
      ['rails.+12V.to-ground', 'OL'],
      ['rails.-12V.to-ground', 'OL'],
      ['rails.idle-current', '0.5'],
    ] as const) {
      await a.waitFor(`${check} ›`);
      await a.type(value);
      await a.press(keys.enter);
      if (value !== 'OL') break;
      await a.waitFor('saved ✓');
      await a.press(keys.enter);
    }
    await a.waitFor('Enter: power is off');
    await a.press('?');
    expect(await a.waitFor('Help — power off (bring-up screen)')).toContain('licensed practice');
    await a.press('?');
    await a.waitFor('Enter: power is off');
  });

  test('batch: the screen and its filter form', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('b');
    await app.waitFor('probebook · batch');
    await app.press('?');
    await app.waitFor('Help — batch screen');
    await app.press('?', 'f', '?');
    await app.waitFor('Help — the filter form (batch screen)');
    await app.press(keys.escape);
    await app.waitFor('Filter the batch');
  });
});

describe('focus: one control has the keys', () => {
  test('r and q in one breath: the q is the rework note’s first letter, never quit', async () => {
    const a = await onBringUp();
    await a.press(keys.enter);
    await a.waitFor('rails.+12V.to-ground ›');
    // No wait between the two: the second key arrives before React draws the form.
    a.stdin.write('r');
    a.stdin.write('q');
    const form = await a.waitFor(/› part\s+q/);
    expect(form).not.toContain('Quit probebook?');
    expect(a.quitCount()).toBe(0);
  });

  test('n and q in one breath on the bench: no quit', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    app.stdin.write('n');
    app.stdin.write('q');
    await app.waitFor('serial:');
    expect(app.quitCount()).toBe(0);
  });

  test('a path pasted with its newline into the capture field is read at once', async () => {
    const a = await onBringUp();
    await a.press(keys.enter);
    await a.waitFor('rails.+12V.to-ground ›');
    // The capture box needs a check that may be read now; the first one is.
    await a.press('a');
    await a.waitFor('Attach a capture');
    a.stdin.write(`${demoCapture}\n`);
    const figures = await a.waitFor('attach these figures', 15000);
    expect(figures).toMatch(/frequency\s+1\.\d+ kHz/);
  });
});
