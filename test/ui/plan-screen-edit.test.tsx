import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, test } from 'vitest';
import { planEditAccess } from '../../src/cli/plan-draft-file.js';
import { keys } from './keys.js';
import { selectRow } from './screen-driver.js';
import { fixturePlan, fixturePlanText, type RenderedApp, renderApp, seedBoard } from './render-app.js';

// The plan screen's `e`: the plan editor on the plan shown, saved through the
// CLI's save path (src/cli/plan-save.ts: only a plan that loads, the old file
// kept as .bak), and the plan screen showing the saved plan afterwards. The
// files live in a temporary folder, as if probebook had been started there.

let app: RenderedApp | undefined;
let folder = '';
afterEach(async () => {
  await app?.cleanup();
  app = undefined;
  if (folder) rmSync(folder, { recursive: true, force: true });
});

/** Settle a just-opened text field (it subscribes to the keyboard after its first frame). */
const settle = () => new Promise((r) => setTimeout(r, 80));

/** The app on the plan screen of the fixture, given as `--plan fixture-0.plan.json` from a folder holding that file. */
async function onPlanScreen(options: { withEditing?: boolean } = {}) {
  folder = mkdtempSync(join(tmpdir(), 'probebook-plan-edit-'));
  writeFileSync(join(folder, 'fixture-0.plan.json'), fixturePlanText);
  const withEditing = options.withEditing ?? true;
  const a = await renderApp({ height: 40, ...(withEditing ? { planEditing: planEditAccess(folder) } : {}) });
  app = a;
  await a.waitFor('probebook · bench');
  await a.press('p');
  await a.waitFor('probebook · plan · ui-fixture');
  return a;
}

/** Type over the selected field and keep it. */
async function typeOver(a: RenderedApp, name: string, text: string) {
  await a.press(keys.enter);
  await a.waitFor(new RegExp(`^${name}: `, 'm'));
  await settle();
  for (let i = 0; i < 12; i++) await a.press(keys.backspace);
  await a.type(text);
  await a.press(keys.enter);
  await a.waitFor((f) => !new RegExp(`^${name}: `, 'm').test(f));
}

const gainRow = (frame: string) => frame.split('\n').find((l) => l.startsWith('amp.gain') || l.includes(' amp.gain ')) ?? '';

describe('plan screen → plan editor', () => {
  test('e is in the footer and the help; without an edit path (a plain App) it is not offered', async () => {
    const a = await onPlanScreen();
    expect(a.frame()).toMatch(/e edit/);
    await a.press('?');
    await a.waitFor('Help — plan');
    expect(a.frame()).toContain('edit this plan in the plan editor');
    // The note, read across the help box's wrapped lines.
    const help = a.frame().replace(/[│\s]+/g, ' ');
    expect(help).toContain('a plan given with --plan is saved over its file (the old one kept as FILE.bak), a plan the log alone keeps as a new file');
    await a.cleanup();
    app = undefined;
    rmSync(folder, { recursive: true, force: true });

    const plain = await onPlanScreen({ withEditing: false });
    expect(plain.frame()).not.toMatch(/e edit/);
    await plain.press('e');
    expect(plain.frame()).toContain('probebook · plan · ui-fixture');
  });

  test('a --plan file: edited, saved in place with a .bak, and the plan screen shows the new targets', async () => {
    const a = await onPlanScreen();
    const before = gainRow(a.frame());
    // Inverting amplifier, gain −Rf/Rin (Sedra & Smith): 15k/10k → −1.5.
    expect(before).toMatch(/TP3\s+-1\.5 V\/V\s/);
    await a.press('e');
    await a.waitFor('probebook · plan editor · fixture-0.plan.json');
    expect(a.frame()).toContain('saved');
    await selectRow(a, /^›.\s*Rf\s+15k 1%/);
    await typeOver(a, 'Rf', '22k 1%');
    await a.waitFor('● unsaved');
    // q belongs to the editor here: it asks before leaving unsaved changes, it never quits the app.
    await a.press('q');
    await a.waitFor('Leave the plan editor?');
    expect(a.quitCount()).toBe(0);
    await a.press('n');
    await a.press('s');
    await a.waitFor('saved fixture-0.plan.json (the previous file kept as fixture-0.plan.json.bak)');

    const saved = JSON.parse(readFileSync(join(folder, 'fixture-0.plan.json'), 'utf8'));
    expect(saved.stages[1].parts).toEqual({ Rin: '10k 1%', Rf: '22k 1%' });
    // Everything else kept: the note, the test points, the uncertainty.
    expect(saved.note).toBe(fixturePlan.note);
    expect(saved.stages[0].testPoints).toEqual(fixturePlan.stages[0]?.testPoints);
    expect(readFileSync(join(folder, 'fixture-0.plan.json.bak'), 'utf8')).toBe(fixturePlanText);

    await a.press(keys.escape);
    await a.waitFor((f) => f.includes('probebook · plan · ui-fixture') && gainRow(f) !== '');
    // 22k/10k → −2.2, from the file as saved.
    expect(gainRow(a.frame())).toMatch(/TP3\s+-2\.2 V\/V\s/);
    expect(a.catalog.filePlans).toHaveLength(1);
    expect(a.catalog.filePlans[0]?.text).toBe(readFileSync(join(folder, 'fixture-0.plan.json'), 'utf8'));
    // Back to the bench: the plan screen was not pushed twice.
    await a.press(keys.escape);
    await a.waitFor('probebook · bench');
    expect(a.quitCount()).toBe(0);
  });

  test('leaving without saving: the file, the catalog and the plan screen are unchanged', async () => {
    const a = await onPlanScreen();
    const hash = a.catalog.filePlans[0]?.hash;
    await a.press('e');
    await a.waitFor('probebook · plan editor');
    await selectRow(a, /^›.\s*Rin\s+10k 1%/);
    await typeOver(a, 'Rin', '4k7 1%');
    await a.press(keys.escape);
    await a.waitFor('Leave the plan editor?');
    await a.press('y');
    await a.waitFor('probebook · plan · ui-fixture');
    expect(gainRow(a.frame())).toMatch(/TP3\s+-1\.5 V\/V\s/);
    expect(readFileSync(join(folder, 'fixture-0.plan.json'), 'utf8')).toBe(fixturePlanText);
    expect(existsSync(join(folder, 'fixture-0.plan.json.bak'))).toBe(false);
    expect(a.catalog.filePlans[0]?.hash).toBe(hash);
  });

  test('a plan the log alone keeps is never changed: its edit is saved as a new file beside, and joins the plans', async () => {
    folder = mkdtempSync(join(tmpdir(), 'probebook-plan-edit-'));
    // A file of that name already there: the edit takes the next free name.
    writeFileSync(join(folder, 'ui-fixture.plan.json'), '{"not": "touched"}\n');
    let hash = '';
    const a = await renderApp({
      height: 40,
      planTexts: [],
      planEditing: planEditAccess(folder),
      setup: async (log) => {
        const { loadPlanText } = await import('../../src/plan/load.js');
        const plan = loadPlanText(fixturePlanText, 'old.plan.json');
        hash = plan.hash;
        await seedBoard(log, plan, 'SNAP-1', []);
      },
    });
    app = a;
    await a.waitFor('SNAP-1');
    await a.press('p');
    await a.waitFor('probebook · plan · ui-fixture');
    await a.press('e');
    await a.waitFor('probebook · plan editor · ui-fixture-2.plan.json');
    // A new file: unsaved until it is written.
    expect(a.frame()).toContain('● unsaved');
    await a.press('s');
    await a.waitFor('saved ui-fixture-2.plan.json');
    await a.press(keys.escape);
    await a.waitFor('probebook · plan · ui-fixture');
    expect(readFileSync(join(folder, 'ui-fixture.plan.json'), 'utf8')).toBe('{"not": "touched"}\n');
    expect(JSON.parse(readFileSync(join(folder, 'ui-fixture-2.plan.json'), 'utf8'))).toEqual(fixturePlan);
    expect(a.catalog.filePlans.map((p) => p.file)).toEqual(['ui-fixture-2.plan.json']);
    // The log's snapshot is still there under its hash, for the runs that used it.
    expect(await a.log.readPlanSnapshot(hash)).toBe(fixturePlanText);
  });

  test('a --plan file that is gone since start: the editor opens on the plan as loaded, as a new file', async () => {
    const a = await onPlanScreen();
    rmSync(join(folder, 'fixture-0.plan.json'));
    await a.press('e');
    await a.waitFor('probebook · plan editor · fixture-0.plan.json');
    expect(a.frame()).toContain('● unsaved');
    expect(a.frame()).toContain('ui-fixture');
  });

  test('a --plan file broken since start: one line saying where and what to do; Esc back to the plan screen, nothing written', async () => {
    const a = await onPlanScreen();
    writeFileSync(join(folder, 'fixture-0.plan.json'), '{"plan": "ui-fixture",\n  "rails": [\n');
    await a.press('e');
    await a.waitFor('✗ plan fixture-0.plan.json, line 3');
    expect(a.frame()).toContain('mend it in a text editor first');
    expect(a.frame()).toContain('Esc back to the plan screen');
    await a.press(keys.escape);
    await a.waitFor('probebook · plan · ui-fixture');
    expect(readFileSync(join(folder, 'fixture-0.plan.json'), 'utf8')).toBe('{"plan": "ui-fixture",\n  "rails": [\n');
    expect(a.quitCount()).toBe(0);
  });
});
