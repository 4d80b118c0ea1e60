import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import type { BenchLog } from '../../src/log/types.js';
import type { Plan } from '../../src/plan/types.js';
import { keys } from './keys.js';
import { type RenderedApp, renderApp, seedBoard } from './render-app.js';

let app: RenderedApp | undefined;
afterEach(async () => {
  await app?.cleanup();
  app = undefined;
});

const rail = (value: number, verdict: 'pass' | 'fail' = 'pass') => ({ check: 'rails.+12V.dc', value, unit: 'V' as const, raw: value.toFixed(2), verdict });

/** Three boards of the fixture plan; FX-0003's +12 V rail reads far out. */
async function threeBoards(a: { log: BenchLog }, plan: Plan) {
  await seedBoard(a.log, plan, 'FX-0001', [rail(12.01)], 'passed');
  await seedBoard(a.log, plan, 'FX-0002', [rail(11.98)], 'passed');
  await seedBoard(a.log, plan, 'FX-0003', [rail(13.9, 'fail')], 'failed');
}

const withThree = () =>
  renderApp({
    setup: async (log, [plan]) => {
      if (!plan) throw new Error('no plan');
      await threeBoards({ log }, plan);
    },
  });

describe('moving between screens', () => {
  test('bench → history of the selected board → back to the bench on the same board', async () => {
    app = await withThree();
    await app.waitFor('FX-0001');
    await app.press('G'); // the oldest board, FX-0001, is listed last
    expect(app.frame()).toMatch(/› FX-0001/);
    await app.press('h');
    await app.waitFor('probebook · history · FX-0001');
    await app.press('?');
    await app.waitFor('Help — history screen');
    await app.press(keys.escape);
    await app.waitFor((f) => !f.includes('Help — history screen'));
    await app.press(keys.escape);
    await app.waitFor('probebook · bench · 3 boards');
    expect(app.frame()).toMatch(/› FX-0001/);
  });

  test('bench → batch → an outlier board’s history → back to the batch → back to the bench', async () => {
    app = await withThree();
    await app.waitFor('FX-0003');
    await app.press('b');
    await app.waitFor('probebook · batch');
    await app.waitFor('rails.+12V.dc');
    await app.press(keys.tab, keys.tab);
    await app.waitFor(/Outliers \(1\)/);
    await app.press(keys.enter);
    await app.waitFor('probebook · history · FX-0003');
    await app.press(keys.escape);
    await app.waitFor('probebook · batch');
    await app.press(keys.escape); // leaves the outlier panel
    await app.press(keys.escape);
    await app.waitFor('probebook · bench');
  });

  test('bench → plan screen of the selected board’s plan → back', async () => {
    app = await withThree();
    await app.waitFor('FX-0003');
    await app.press('p');
    await app.waitFor('probebook · plan · ui-fixture');
    expect(app.frame()).toContain('worst-case band');
    await app.press(keys.escape);
    await app.waitFor('probebook · bench');
  });

  test('with no board and no plan the keys explain what is missing instead of failing', async () => {
    app = await renderApp({ planTexts: [] });
    await app.waitFor('No boards');
    await app.press('h');
    await app.waitFor('no board selected');
    await app.press('p');
    await app.waitFor('no plan to show: start probebook with --plan FILE');
    await app.press('n');
    await app.type('FX-0100');
    await app.press(keys.enter);
    await app.waitFor('no plan to choose from');
    expect(app.frame()).toContain('probebook · bench');
  });
});

describe('bench screen', () => {
  test('? shows the keys and the cautions; Esc closes it', async () => {
    app = await renderApp();
    await app.waitFor('No boards');
    await app.press('?');
    const help = await app.waitFor('Help — bench screen');
    expect(help).toContain('current-limited');
    expect(help).toContain('licensed practice');
    await app.press(keys.escape);
    await app.waitFor('No boards');
  });

  test('/ filters by serial as it is typed; Esc clears the filter', async () => {
    app = await withThree();
    await app.waitFor('FX-0003');
    await app.press('/');
    await app.type('0002');
    await app.waitFor('1 of 3 boards');
    expect(app.frame()).toContain('FX-0002');
    expect(app.frame()).not.toContain('FX-0001');
    await app.press(keys.enter);
    expect(app.frame()).toContain('1 of 3 boards');
    await app.press(keys.escape);
    await app.waitFor('probebook · bench · 3 boards');
    expect(app.frame()).toContain('FX-0001');
  });

  test('a long list pages and scrolls, keeping the selection in view within 24 rows', async () => {
    app = await renderApp({
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        for (let i = 1; i <= 40; i++)
          await log.startRun(`LOT-${String(i).padStart(3, '0')}`, { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator: 'x' });
      },
    });
    await app.waitFor('40 boards');
    const rows = () => app?.frame().split('\n') ?? [];
    expect(rows().length).toBeLessThanOrEqual(23);
    const selected = () => rows().find((line) => line.startsWith('› '));
    const first = selected();
    await app.press(keys.pageDown);
    expect(selected()).not.toBe(first);
    await app.press('G');
    expect(selected()).toMatch(/› LOT-\d{3}/);
    expect(rows().length).toBeLessThanOrEqual(23);
    await app.press('g');
    expect(selected()).toBe(first);
  });

  test('a damaged board file is reported, left untouched, and the other boards still listed', async () => {
    const damaged = '{"schemaVersion": 1, "serial": "FX-0009", "runs": [';
    app = await renderApp({
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        await threeBoards({ log }, plan);
        await writeFile(join(log.dir, 'boards', 'FX-0009.json'), damaged);
      },
    });
    await app.waitFor('1 board file cannot be read');
    expect(app.frame()).toContain('FX-0001');
    expect(app.frame()).toContain('probebook · bench · 3 boards');
    expect(await readFile(join(app.dir, 'boards', 'FX-0009.json'), 'utf8')).toBe(damaged);
  });

  test('follows the terminal when it is resized', async () => {
    app = await renderApp({
      followTerminal: true,
      setup: async (log, [plan]) => {
        if (!plan) throw new Error('no plan');
        await threeBoards({ log }, plan);
      },
    });
    // ink-testing-library's terminal is 100 columns: the counts columns fit.
    await app.waitFor('readings');
    Object.defineProperty(app.stdout, 'columns', { value: 70, configurable: true });
    app.stdout.emit('resize');
    await app.waitFor((f) => !f.includes('readings') && f.includes('FX-0001'));
    for (const line of app.frame().split('\n')) expect([...line].length).toBeLessThanOrEqual(70);
  });
});
