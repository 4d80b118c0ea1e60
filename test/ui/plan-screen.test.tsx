import { render } from 'ink-testing-library';
import { afterEach, describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { loadPlanText } from '../../src/plan/load.js';
import { formatValue } from '../../src/units/format.js';
import { formatBand, formatContributor } from '../../src/ui/plan-screen/format-band.js';
import { PlanScreen } from '../../src/ui/plan-screen/plan-screen.js';
import { keys } from './keys.js';
import { fixturePlan } from './render-app.js';
import { waitForFrame, writeAndWait } from './wait-frame.js';

const plan = loadPlanText(JSON.stringify(fixturePlan), 'fixture.plan.json');
const targets = computeTargets(plan, { trials: 400, seed: 1 });

// The same board with a gain of −15 into ±12 V rails: the output must clip.
const clipping = loadPlanText(
  JSON.stringify({ ...fixturePlan, stages: [fixturePlan.stages[0], { ...fixturePlan.stages[1], parts: { Rin: '10k 1%', Rf: '150k 1%' } }] }),
  'clipping.plan.json',
);
const clippingTargets = computeTargets(clipping, { trials: 400, seed: 1 });

let instance: ReturnType<typeof render> | undefined;
afterEach(() => instance?.unmount());

async function show(width: number, height: number, p = plan, t = targets) {
  let exits = 0;
  const view = render(<PlanScreen plan={p} targets={t} width={width} height={height} onExit={() => void exits++} />);
  instance = view;
  const frame = () => view.lastFrame() ?? '';
  /** Poll until the condition holds (a loaded machine can be slow to draw), then return the frame. */
  const until = async (test: (f: string) => boolean, what: string) => {
    try {
      return await waitForFrame(view, test);
    } catch (error) {
      throw new Error(`timed out waiting for ${what}; ${String(error)}`);
    }
  };
  await until((f) => f.includes('probebook · plan'), 'the plan screen');
  return {
    frame,
    until,
    /** Send keys, each followed by its frame (or a short wait when nothing changes). */
    press: async (...sequence: string[]) => {
      for (const key of sequence) await writeAndWait(view, key);
    },
    exits: () => exits,
  };
}

describe('plan screen', () => {
  test('lists every target with its test point, nominal, worst-case band and top contributor', async () => {
    const s = await show(80, 40);
    const frame = s.frame();
    expect(frame).toContain('probebook · plan · ui-fixture — UI test board (invented)');
    expect(frame).toContain(`${targets.targets.length} checks`);
    expect(frame).toContain('Design warnings (0)');
    for (const t of targets.targets) expect(frame).toContain(t.check);
    const freq = targets.targets.find((t) => t.check === 'osc.freq');
    if (!freq) throw new Error('the fixture has osc.freq');
    const row = frame.split('\n').find((line) => line.includes('osc.freq'));
    expect(row).toContain('TP1');
    expect(row).toContain(formatValue(freq.nominal, 'Hz'));
    expect(row).toContain(formatBand(freq.worst, 'Hz'));
    expect(row).toContain(formatContributor(freq.contributors[0]));
    // Unpowered checks are one-sided limits: a minimum resistance, no maximum.
    expect(frame.split('\n').find((line) => line.includes('rails.+12V.to-ground'))).toContain('≥ 100 Ω');
    // 80 columns: the statistical band moves to the detail lines.
    expect(frame).not.toContain('statistical band ');
    expect(frame).toContain('statistical');
  });

  test('contributors carry the designators the plan names in its refs', async () => {
    const freq = targets.targets.find((t) => t.check === 'osc.freq');
    const part = freq?.contributors[0]?.part ?? '';
    const [stage = '', role = ''] = part.split('.');
    // Name that part's designator (invented) in the plan's refs, and nothing else.
    const withRefs = loadPlanText(
      JSON.stringify({ ...fixturePlan, stages: fixturePlan.stages.map((st) => (st.id === stage ? { ...st, refs: { [role]: 'C42' } } : st)) }),
      'refs.plan.json',
    );
    const s = await show(80, 40, withRefs, targets);
    const row = s
      .frame()
      .split('\n')
      .find((line) => line.includes('osc.freq'));
    expect(row).toContain(`${part} (C42)`);
    expect(formatContributor(freq?.contributors[0], new Map([[part, 'C42']]))).toMatch(/^\S+ \(C42\) \d+%$/);
  });

  test('the statistical band gets its own column on a wide terminal', async () => {
    const s = await show(130, 40);
    const freq = targets.targets.find((t) => t.check === 'osc.freq');
    if (!freq) throw new Error('the fixture has osc.freq');
    expect(s.frame()).toContain('statistical band');
    expect(
      s
        .frame()
        .split('\n')
        .find((line) => line.includes('osc.freq') && line.includes('TP1')),
    ).toContain(formatBand(freq.stat, 'Hz'));
  });

  test('moves and scrolls with the arrows, j/k, g/G; the detail follows the selection', async () => {
    const s = await show(80, 16);
    const last = targets.targets[targets.targets.length - 1];
    const first = targets.targets[0];
    if (!last || !first) throw new Error('the fixture has targets');
    expect(s.frame()).not.toContain(last.check);
    await s.press('G');
    expect(s.frame()).toContain(`› ${last.check}`);
    expect(s.frame()).toContain(`how: ${last.how}`.slice(0, 40));
    expect(s.frame()).not.toContain(`${first.check} `);
    await s.press('g', keys.down, 'j');
    expect(s.frame()).toContain(`› ${targets.targets[2]?.check}`);
    await s.press('k', keys.up);
    expect(s.frame()).toContain(`› ${first.check}`);
  });

  test('design warnings are listed and Tab moves the keys to them', async () => {
    expect(clippingTargets.warnings.length).toBeGreaterThan(0);
    const s = await show(80, 23, clipping, clippingTargets);
    expect(s.frame()).toContain(`Design warnings (${clippingTargets.warnings.length})`);
    expect(s.frame()).toContain(`⚠ ${clippingTargets.warnings[0]?.stage}: `);
    await s.press(keys.tab);
    expect(s.frame()).toContain('↑↓ scroll, Tab back to the targets');
    await s.press(keys.tab);
    expect(s.frame()).not.toContain('↑↓ scroll, Tab back');
  });

  test('? opens the help, Esc closes it, Esc again goes back', async () => {
    const s = await show(80, 23);
    await s.press('?');
    expect(s.frame()).toContain('Help — plan screen');
    expect(s.frame()).toContain('Tab');
    await s.press(keys.escape);
    expect(s.frame()).toContain('Design warnings');
    expect(s.exits()).toBe(0);
    instance?.stdin.write(keys.escape);
    const deadline = Date.now() + 5000;
    while (s.exits() === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 10));
    expect(s.exits()).toBe(1);
  });

  test('fits 80×24: no line wider than the terminal, no more rows than it has', async () => {
    const s = await show(80, 23, clipping, clippingTargets);
    const lines = s.frame().split('\n');
    expect(lines.length).toBeLessThanOrEqual(23);
    for (const line of lines) expect([...line].length).toBeLessThanOrEqual(80);
  });
});
