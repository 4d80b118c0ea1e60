import { createHash } from 'node:crypto';
import { render } from 'ink-testing-library';
import { beforeAll, describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { TargetsCache } from '../../src/log/targets-cache.js';
import { BatchScreen } from '../../src/ui/batch/batch.js';
import { HistoryScreen } from '../../src/ui/history/history.js';
import { PlanCatalog } from '../../src/ui/bench/plan-catalog.js';
import { fillDemoLog } from '../review/demo-boards.js';
import { makeLog, type TestLog } from '../review/real-log.js';
import { keys } from './keys.js';
import { driveScreen } from './screen-driver.js';

// The batch screen takes its bands as the bring-up screen takes its targets: through the
// app's plan catalog, computed in the targets worker while the screen answers keys.

let t: TestLog;
/** An invented plan the loader refuses (an unknown stage kind), kept in the log by one board's run. */
const brokenText = JSON.stringify({
  plan: 'broken-demo',
  title: 'Invented, refused by the loader',
  rails: [{ id: '+9V', nominal: '9 V', tol: '5%' }],
  stages: [{ id: 'x', kind: 'no-such-kind' }],
});
const brokenHash = createHash('sha256').update(brokenText).digest('hex');

beforeAll(async () => {
  t = await makeLog();
  await fillDemoLog(t);
  const run = await t.log.startRun('BX-0001', { plan: 'broken-demo', planHash: brokenHash, planText: brokenText, operator: 'tess' });
  await t.log.appendReading('BX-0001', {
    run: run.id,
    check: 'x.level',
    value: 1.5,
    unit: 'V',
    raw: '1.5',
    operator: 'tess',
    verdict: 'pass',
    planHash: brokenHash,
  });
  await t.log.endRun('BX-0001', run.id, 'passed');
});

function screen(catalog: PlanCatalog, width = 80) {
  let exits = 0;
  const r = render(<BatchScreen log={t.log} catalog={catalog} width={width} height={23} onExit={() => void exits++} onOpenBoard={() => undefined} />);
  return { ...driveScreen(r), exits: () => exits };
}

const catalogOf = (trials: number) => new PlanCatalog(t.log, [], { trials, seed: 1, targetsCache: new TargetsCache({ dir: null, compute: computeTargets }) });

describe('batch screen targets off the UI thread', () => {
  test('progress in percent, ? and Esc answered while the worker computes the bands', async () => {
    // Enough trials that the worker is still busy while the keys are pressed (a few seconds here; the figure is not asserted).
    const catalog = catalogOf(600_000);
    const s = screen(catalog);
    await s.waitFor(/computing the targets of osc-demo… \d+ %/, 20_000);
    expect(s.frame()).toContain('Esc leaves');
    await s.press('?');
    await s.waitFor('Histogram marks');
    await s.press(keys.escape);
    await s.waitFor(/computing the targets of osc-demo… \d+ %/);
    await s.press(keys.escape);
    expect(s.exits()).toBe(1);
    // The keys were answered before the bands were ready: nothing held this thread.
    expect(catalog.hasTargets(t.plan)).toBe(false);
    s.unmount();
    // The computation goes on and lands in the cache; the screen opened again hears it and shows the figures.
    const again = screen(catalog);
    await again.waitFor('[Histogram]', 60_000);
    expect(catalog.hasTargets(t.plan)).toBe(true);
    again.unmount();
  }, 90_000);

  test('a plan revision that cannot be computed: the figures without its bands, and one line why', async () => {
    const s = screen(catalogOf(2000));
    await s.waitFor('[Histogram]', 30_000);
    const f = s.frame();
    const warning = f.split('\n').find((l) => l.startsWith('!'));
    expect(warning).toMatch(/^! without bands: plan snapshot [0-9a-f]{12} would not load: /);
    expect([...(warning ?? '')].length).toBeLessThanOrEqual(80);
    // The whole reason names what is wrong (the line on screen is cut at the terminal's width).
    const wide = screen(catalogOf(2000), 200);
    await wide.waitFor('[Histogram]', 30_000);
    expect(wide.frame()).toMatch(/! without bands: plan snapshot [0-9a-f]{12} would not load: .*no-such-kind/);
    wide.unmount();
    // The osc-demo checks keep their bands (Cp, Cpk); the broken plan's check is counted, without Cp or Cpk.
    expect(f).toMatch(/osc-demo osc\.freq\s+6\s+5\s+0\s+1/);
    expect(f).toMatch(/broken-demo x\.lev\S*\s+1\s+1\s+0\s+0\s+100 %\s+—\s+—/);
    s.unmount();
  }, 60_000);

  test('bands already in the cache: figures at once, no progress line', async () => {
    const catalog = catalogOf(2000);
    // A first visit computes them.
    const first = screen(catalog);
    await first.waitFor('[Histogram]', 30_000);
    first.unmount();
    expect(catalog.hasTargets(t.plan)).toBe(true);
    const second = screen(catalog);
    await second.waitFor('[Histogram]', 5000);
    expect(second.frames.some((frame) => frame.includes('computing the targets'))).toBe(false);
    second.unmount();
  }, 60_000);
});

describe('history screen targets off the UI thread', () => {
  test('a board whose plan has no cached targets: progress, keys answered, then the timeline', async () => {
    const catalog = catalogOf(600_000);
    let exits = 0;
    const r = render(<HistoryScreen log={t.log} serial="PB-0003" catalog={catalog} width={80} height={23} onExit={() => void exits++} />);
    const s = driveScreen(r);
    await s.waitFor(/computing the targets of osc-demo… \d+ %/, 20_000);
    await s.press('?');
    await s.waitFor('Help');
    await s.press(keys.escape);
    await s.press(keys.escape);
    expect(exits).toBe(1);
    expect(catalog.hasTargets(t.plan)).toBe(false);
    s.unmount();
    const again = driveScreen(render(<HistoryScreen log={t.log} serial="PB-0003" catalog={catalog} width={80} height={23} onExit={() => undefined} />));
    await again.waitFor('osc.Ct', 60_000);
    again.unmount();
  }, 90_000);
});
