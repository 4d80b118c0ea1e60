import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { stageKinds } from '../../src/circuit/registry.js';
import {
  addRail,
  addStage,
  exampleFrom,
  getAt,
  inputChoices,
  moveStage,
  newDraft,
  parseDraft,
  pathKeys,
  removeAt,
  serialiseDraft,
  setAt,
  setInput,
  setRef,
  setTestPoint,
  stagesOf,
} from '../../src/plan/draft.js';
import { checkPlanText, loadPlanText } from '../../src/plan/load.js';

const demoDir = join(import.meta.dirname, '..', '..', 'demo');
const demos = readdirSync(demoDir).filter((f) => f.endsWith('.plan.json'));

describe('draft round trip', () => {
  test.each(demos)('%s: opened and saved without edits, only whitespace changes', (name) => {
    const text = readFileSync(join(demoDir, name), 'utf8');
    const saved = serialiseDraft(parseDraft(text));
    // Whitespace only: the same JSON, key for key and in the same order.
    expect(JSON.stringify(JSON.parse(saved))).toBe(JSON.stringify(JSON.parse(text)));
    expect(saved).toMatch(/^\{\n {2}"plan": /);
    expect(saved.endsWith('}\n')).toBe(true);
    // Stable: saving the saved text again gives the same bytes.
    expect(serialiseDraft(parseDraft(saved))).toBe(saved);
    expect(checkPlanText(saved, name)).toEqual([]);
  });

  test('keys the editor does not know survive, where they were', () => {
    const text = readFileSync(join(demoDir, demos[0] as string), 'utf8');
    const json = JSON.parse(text) as Record<string, unknown> & { stages: Record<string, unknown>[] };
    json['x-bench'] = { station: 3 };
    (json.stages[0] as Record<string, unknown>)['x-note'] = 'from the layout review';
    (json.stages[0] as Record<string, unknown>)['refs'] = { Ct: 'C7' };
    const saved = JSON.parse(serialiseDraft(setAt(parseDraft(JSON.stringify(json)), ['title'], 'Renamed'))) as typeof json;
    expect(saved['x-bench']).toEqual({ station: 3 });
    expect(saved.stages[0]?.['x-note']).toBe('from the layout review');
    expect(saved.stages[0]?.['refs']).toEqual({ Ct: 'C7' });
    expect(saved['title']).toBe('Renamed');
    // The unknown top-level key goes after the plan's own keys.
    expect(Object.keys(saved).at(-1)).toBe('x-bench');
  });

  test("keys come out in the plan's usual order whatever order they were written in", () => {
    const messy = {
      stages: [{ parts: { R: '1k 1%', C: '10n 5%' }, testPoints: { out: 'TP2' }, input: 'in.out', kind: 'rc-lowpass', id: 'f' }],
      rails: [{ tol: '5%', nominal: '5 V', id: '+5V' }],
      title: 'T',
      plan: 'p',
    };
    const text = serialiseDraft(messy);
    const parsed = JSON.parse(text) as { stages: Record<string, unknown>[]; rails: Record<string, unknown>[] };
    expect(Object.keys(parsed)).toEqual(['plan', 'title', 'rails', 'stages']);
    expect(Object.keys(parsed.rails[0] ?? {})).toEqual(['id', 'nominal', 'tol']);
    expect(Object.keys(parsed.stages[0] ?? {})).toEqual(['id', 'kind', 'input', 'parts', 'testPoints']);
    expect(text).toContain('"parts": {"R": "1k 1%", "C": "10n 5%"}');
  });
});

describe('draft edits', () => {
  test('a new draft has every header default and loads once it has a stage', () => {
    const d = newDraft('bench-7');
    expect(getAt(d, ['plan'])).toBe('bench-7');
    expect(checkPlanText(serialiseDraft(d), 'new.plan.json').map((p) => p.path)).toEqual(['stages']);
    const withStage = addStage(d, 'divider');
    expect(checkPlanText(serialiseDraft(withStage), 'new.plan.json')).toEqual([]);
  });

  test('every kind of the registry gets a stage its own parser accepts', () => {
    let d = newDraft('all');
    for (const kind of Object.keys(stageKinds)) d = addStage(d, kind);
    expect(stagesOf(d).map((s) => s['kind'])).toEqual(Object.keys(stageKinds));
    expect(checkPlanText(serialiseDraft(d), 'all.plan.json')).toEqual([]);
  });

  test('a stage that takes an input is wired to the stage before it; ids stay unique', () => {
    let d = addStage(newDraft(), 'signal-in');
    d = addStage(d, 'rc-lowpass');
    d = addStage(d, 'rc-lowpass');
    const stages = stagesOf(d);
    expect(stages.map((s) => s['id'])).toEqual(['signal', 'rc', 'rc2']);
    expect(stages[1]?.['input']).toBe('signal.out');
    expect(stages[2]?.['input']).toBe('rc.out');
    expect(inputChoices(d, 2)).toEqual(['signal.out', 'rc.out']);
  });

  test('set, remove, move, input, test point and ref', () => {
    let d = addStage(addStage(newDraft(), 'signal-in'), 'rc-lowpass');
    d = setAt(d, ['stages', 1, 'parts', 'R'], '4k7 1%');
    expect(getAt(d, pathKeys('stages[1].parts.R'))).toBe('4k7 1%');
    d = setTestPoint(d, 1, 'out', 'TP4');
    d = setRef(d, 1, 'C', 'C7');
    expect(stagesOf(d)[1]?.['testPoints']).toEqual({ out: 'TP4' });
    expect(stagesOf(d)[1]?.['refs']).toEqual({ C: 'C7' });
    d = setRef(d, 1, 'C', '');
    expect(stagesOf(d)[1]?.['refs']).toBeUndefined();
    d = setInput(d, 1, undefined);
    expect(stagesOf(d)[1]?.['input']).toBeUndefined();
    d = setInput(d, 1, 'signal.out');
    expect(Object.keys(stagesOf(d)[1] ?? {}).slice(0, 3)).toEqual(['id', 'kind', 'input']);
    const before = d;
    expect(moveStage(d, 0, -1)).toBe(before);
    d = moveStage(d, 1, -1);
    expect(stagesOf(d).map((s) => s['id'])).toEqual(['rc', 'signal']);
    // The loader orders stages by their inputs: the moved plan still loads, in chain order.
    expect(loadPlanText(serialiseDraft(d), 'm.plan.json').stages.map((s) => s.id)).toEqual(['signal', 'rc']);
    d = removeAt(d, 'stages', 0);
    expect(stagesOf(d).map((s) => s['id'])).toEqual(['signal']);
    d = addRail(d);
    expect(getAt(d, ['rails', 2, 'id']) as string).toBe('+5V');
    expect(before).not.toBe(d);
    expect(getAt(before, ['rails', 2])).toBeUndefined();
  });

  test('paths as the loader writes them', () => {
    expect(pathKeys('stages[1].parts.Rt')).toEqual(['stages', 1, 'parts', 'Rt']);
    expect(pathKeys('checkUncertainty["osc.freq"]')).toEqual(['checkUncertainty', 'osc.freq']);
    expect(pathKeys('stages[0].branches[2].R')).toEqual(['stages', 0, 'branches', 2, 'R']);
  });

  test("the example a kind's message gives", () => {
    expect(exampleFrom('missing; write a resistance, e.g. "4k7 1%"')).toBe('4k7 1%');
    expect(exampleFrom('missing; write "sine" or "triangle"')).toBe('sine');
    expect(exampleFrom('missing; write a list, e.g. [{ "a": 1 }]')).toEqual([{ a: 1 }]);
    expect(exampleFrom('missing')).toBeUndefined();
  });
});
