import { render } from 'ink-testing-library';
import { afterEach, describe, expect, test } from 'vitest';
import { stageKinds } from '../../src/circuit/registry.js';
import { type Draft, newDraft, parseDraft } from '../../src/plan/draft.js';
import { loadPlanText } from '../../src/plan/load.js';
import { formatValue } from '../../src/units/format.js';
import { parseValue } from '../../src/units/parse.js';
import { PlanEditor } from '../../src/ui/plan-editor/plan-editor.js';
import { keys } from './keys.js';
import { driveScreen, selectRow } from './screen-driver.js';

/** An invented two-stage board: a bench generator into an RC low-pass (values are illustrative). */
const twoStage = {
  plan: 'editor-fixture',
  title: 'Editor test board (invented)',
  rails: [{ id: '+12V', nominal: '12 V', tol: '5%' }],
  stages: [
    { id: 'gen', kind: 'signal-in', shape: 'sine', peak: '1 V 2%', frequency: '1 kHz 0.5%', testPoints: { out: 'J1' } },
    { id: 'filt', kind: 'rc-lowpass', input: 'gen.out', parts: { R: '1k 1%', C: '10n 5%' }, 'x-layout': 'keep me' },
  ],
};
const twoStageText = `${JSON.stringify(twoStage, null, 2)}\n`;

let view: ReturnType<typeof driveScreen> | undefined;
/** A just-opened field subscribes to the keyboard right after its first frame. */
const settle = () => new Promise((r) => setTimeout(r, 80));
afterEach(() => view?.unmount());

function open(options: { initial?: Draft; savedText?: string | null; width?: number; height?: number } = {}) {
  const saves: string[] = [];
  let exits = 0;
  const r = render(
    <PlanEditor
      file="board.plan.json"
      initial={options.initial ?? parseDraft(twoStageText)}
      savedText={options.savedText === undefined ? twoStageText : options.savedText}
      save={(text) => {
        loadPlanText(text, 'board.plan.json');
        saves.push(text);
      }}
      onExit={() => void exits++}
      width={options.width ?? 80}
      height={options.height ?? 23}
      trials={300}
    />,
  );
  view = driveScreen(r);
  return { ...view, saves, exits: () => exits };
}

describe('plan editor', () => {
  test('a new plan: the board header with its defaults and a line explaining the selected field', async () => {
    const s = open({ initial: newDraft('bench-7'), savedText: null });
    await s.waitFor('plan id');
    expect(s.frame()).toContain('bench-7');
    expect(s.frame()).toContain('● unsaved');
    expect(s.frame()).toMatch(/plan id — the plan id/);
    await selectRow(s, /nominal\s+12 V/);
    expect(s.frame()).toContain('nominal — the rail voltage, signed');
    await selectRow(s, /op-amp slew\s+0\.5 V\/us/);
    expect(s.frame()).toContain('slew rate of the op-amp');
    await selectRow(s, /uncertainty V\s+0\.5% \+ 2 mV/);
    expect(s.frame()).toContain("the voltmeter's uncertainty");
    // Nothing to compute yet: the plan has no stage, and says so.
    expect(s.frame()).toContain('a plan needs at least one stage');
  });

  test('the catalog lists every kind of the registry with its summary and roles; picking one adds a stage that loads', async () => {
    const s = open({ initial: newDraft('cat'), savedText: null, height: 40 });
    await s.waitFor('plan id');
    await s.press('a');
    await s.waitFor(`Add a stage — ${Object.keys(stageKinds).length} kinds`);
    for (const [name, kind] of Object.entries(stageKinds)) {
      expect(s.frame()).toContain(name);
      expect(s.frame()).toContain(kind.summary.slice(0, 20));
    }
    const names = Object.keys(stageKinds);
    const rc = names.indexOf('rc-lowpass');
    for (let i = 0; i < rc; i++) await s.press(keys.down);
    await s.waitFor('shunt capacitor to ground');
    await s.press(keys.enter);
    await s.waitFor('added a rc-lowpass stage');
    expect(s.frame()).toMatch(/▸ stage 1\s+rc\s+rc-lowpass/);
    // rc-lowpass takes an input and no stage gives one yet: said on the screen.
    await s.waitFor(/input/);
  });

  test('at 80×24 the selected kind shows its whole summary, its rail setting and every part role', async () => {
    const s = open({ initial: newDraft('cat'), savedText: null, width: 80, height: 23 });
    await s.waitFor('plan id');
    await s.press('a');
    await s.waitFor('Add a stage');
    for (const [i, [name, kind]] of Object.entries(stageKinds).entries()) {
      if (i > 0) await s.press(keys.down);
      await s.waitFor(new RegExp(`› ${name}\\s`));
      // Ink wraps the summary at word boundaries: compare with the frame's spaces and borders taken out.
      const flat = s.frame().replace(/[│\s]+/g, '');
      expect(flat, name).toContain(kind.summary.replace(/\s+/g, ''));
      for (const r of kind.roles) expect(s.frame(), `${name} ${r.role}`).toMatch(new RegExp(`\\s${r.role.replace(/[.[\]]/g, '\\$&')}\\s`));
      if (kind.traits?.railSetting) expect(s.frame(), name).toContain(`fed from the rail named in "${kind.traits.railSetting}"`);
      expect(s.frame().split('\n').length).toBeLessThanOrEqual(24);
    }
  });

  test("every part of a stage has a row: input, each role, its ref, each output's test point, other keys as JSON", async () => {
    const s = open({ height: 80 });
    await s.waitFor('▸ stage 2');
    const f = s.frame();
    expect(f).toMatch(/input\s+gen\.out/);
    expect(f).toMatch(/R\s+1k 1%/);
    expect(f).toMatch(/C\s+10n 5%/);
    expect(f).toMatch(/refs R\s+—/);
    expect(f).toMatch(/refs C\s+—/);
    expect(f).toMatch(/TP out\s+J1/);
    expect(f).toMatch(/peak\s+1 V 2%/);
    expect(f).toMatch(/shape\s+sine/);
    expect(f).toMatch(/x-layout\s+keep me/);
  });

  test("the value parser's own message as you type, and the reading of a good value", async () => {
    const s = open();
    await s.waitFor('editor-fixture');
    await selectRow(s, /^›.\s*R\s+1k 1%/);
    await s.press(keys.enter);
    await s.waitFor(/^R: 1k 1%/m);
    await settle();
    for (let i = 0; i < 6; i++) await s.press(keys.backspace);
    await s.press('4k7 x');
    const bad = parseValue('4k7 x', { expected: 'Ω' });
    expect(bad.ok).toBe(false);
    await s.waitFor(`✗ ${bad.ok ? '' : bad.message}`);
    await s.press(keys.backspace);
    await s.press('1%');
    await s.waitFor('✓ = 4.7 kΩ ± 1 %');
  });

  test('live targets: the cut-off moves after a keystroke, before Enter, and the statistical band follows', async () => {
    const s = open({ width: 120, height: 30 });
    await s.waitFor('statistical band done');
    // First-order RC low-pass, fc = 1/(2πRC) (any circuits handbook): 1k, 10n → 15.92 kHz.
    expect(s.frame()).toContain(formatValue(1 / (2 * Math.PI * 1e3 * 10e-9), 'Hz'));
    await selectRow(s, /^›.\s*R\s+1k 1%/);
    await s.press(keys.enter);
    await s.waitFor(/^R: 1k 1%/m);
    await settle();
    await s.press(keys.backspace);
    await s.press(keys.backspace);
    await s.press(keys.backspace);
    await s.press(keys.backspace);
    await s.press(keys.backspace);
    await s.press('2k2');
    const fc = formatValue(1 / (2 * Math.PI * 2.2e3 * 10e-9), 'Hz');
    await s.waitFor(fc);
    await s.waitFor('statistical band done');
    expect(s.frame()).toMatch(/filt\.fc\s+7\.234 kHz/);
    // Enter keeps it; the form shows the new value and the plan is unsaved.
    await s.press(keys.enter);
    await s.waitFor('● unsaved');
    expect(s.frame()).toMatch(/R\s+2k2/);
  });

  test('save refused on an error: the selection goes to the row and the reason is said; nothing is written', async () => {
    const s = open();
    await s.waitFor('editor-fixture');
    await selectRow(s, /^›.\s*C\s+10n 5%/);
    await s.press(keys.enter);
    await s.waitFor(/^C: 10n 5%/m);
    await settle();
    for (let i = 0; i < 6; i++) await s.press(keys.backspace);
    await s.press('10 x');
    await s.press(keys.enter);
    await s.waitFor(/^›✗\s*C\s+10 x/m);
    await s.press(keys.up);
    await s.waitFor(/^›.\s*R\s+1k/m);
    await s.press('s');
    await s.waitFor('not saved: stages[1].parts.C');
    expect(s.frame()).toMatch(/^›✗\s*C\s+10 x/m);
    expect(s.saves).toEqual([]);
  });

  test('save writes the plan as stable JSON that loads, with unknown keys kept', async () => {
    const s = open();
    await s.waitFor('editor-fixture');
    await selectRow(s, /refs C/);
    await s.press(keys.enter);
    await s.waitFor(/^refs C:.*\n✓ empty/m);
    await settle();
    await s.press('C7');
    await s.press(keys.enter);
    await s.waitFor(/refs C\s+C7/);
    await s.press('s');
    await s.waitFor('saved board.plan.json');
    expect(s.saves).toHaveLength(1);
    const saved = JSON.parse(s.saves[0] as string) as typeof twoStage & { stages: { refs?: unknown; 'x-layout'?: unknown }[] };
    expect(saved.stages[1]?.refs).toEqual({ C: 'C7' });
    expect(saved.stages[1]?.['x-layout']).toBe('keep me');
    expect(s.frame()).toContain('saved');
  });

  test('Esc with unsaved changes asks first; n stays, y leaves; without changes Esc leaves at once', async () => {
    const s = open();
    await s.waitFor('editor-fixture');
    expect(s.frame()).not.toContain('unsaved');
    await s.press(keys.escape);
    expect(s.exits()).toBe(1);
    await selectRow(s, /^›.\s*R\s+1k/);
    await s.press(keys.enter);
    await s.waitFor(/^R: 1k 1%/m);
    await settle();
    for (let i = 0; i < 5; i++) await s.press(keys.backspace);
    await s.press('1k2 1%');
    await s.press(keys.enter);
    await s.waitFor('● unsaved');
    await s.press(keys.escape);
    await s.waitFor('Leave the plan editor?');
    await s.press('?');
    await s.waitFor('Staying is the default');
    await s.press('n');
    await s.waitFor(/R\s+1k2 1%/);
    expect(s.exits()).toBe(1);
    await s.press(keys.escape);
    await s.waitFor('Leave the plan editor?');
    await s.press('y');
    expect(s.exits()).toBe(2);
  });

  test('remove asks, reorder moves, the input is chosen among the upstream outputs', async () => {
    const s = open({ height: 40 });
    await s.waitFor('editor-fixture');
    await selectRow(s, /input\s+gen\.out/);
    await s.press(keys.right);
    await s.waitFor(/input\s+\(empty\)/);
    await s.waitFor('needs an input');
    await s.press(keys.right);
    await s.waitFor(/input\s+gen\.out/);
    await s.press('[');
    await s.waitFor(/▸ stage 1\s+filt/);
    await s.press('d');
    await s.waitFor('Remove stage filt?');
    await s.press('y');
    await s.waitFor('removed stage filt');
    await s.waitFor(/^(?![\s\S]*rc-lowpass)[\s\S]*▸ stage 1\s+gen/);
  });

  test('? shows the help on the screen and in the catalog', async () => {
    const s = open();
    await s.waitFor('editor-fixture');
    await s.press('?');
    await s.waitFor('Help — plan editor screen');
    expect(s.frame()).toContain('Ctrl-S');
    await s.press(keys.escape);
    await s.waitFor('editor-fixture');
    await s.press('a');
    await s.waitFor('↑↓ choose');
    await s.press('?');
    await s.waitFor('example values its kind accepts');
    await s.press(keys.escape);
    await s.waitFor('editor-fixture');
  });

  test('80×24 puts the targets under the form; a wide terminal puts them beside it with the statistical band', async () => {
    const narrow = open();
    await narrow.waitFor('statistical band done');
    const lines = narrow.frame().split('\n');
    expect(lines.length).toBeLessThanOrEqual(23);
    expect(lines.every((l) => l.length <= 80)).toBe(true);
    expect(lines.findIndex((l) => l.startsWith('Targets'))).toBeGreaterThan(lines.findIndex((l) => l.includes('plan id')));
    narrow.unmount();
    const wide = open({ width: 140, height: 30 });
    await wide.waitFor('statistical band done');
    expect(wide.frame()).toMatch(/plan id.*Targets/);
    expect(wide.frame()).toMatch(/worst-case band\s+statistical band/);
  });
});
