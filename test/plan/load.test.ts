import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { afterAll, describe, expect, test } from 'vitest';
import { PlanError } from '../../src/plan/errors.js';
import { loadPlanFile, loadPlanText } from '../../src/plan/load.js';
import { fakeKinds, fakePlan } from './fake-kinds.js';

const file = 'test.plan.json';

function load(plan: unknown): ReturnType<typeof loadPlanText> {
  return loadPlanText(JSON.stringify(plan, null, 2), file, fakeKinds);
}

/** The PlanError a plan raises (fails the test when it loads). */
function errorOf(plan: unknown, text?: string): PlanError {
  try {
    loadPlanText(text ?? JSON.stringify(plan, null, 2), file, fakeKinds);
  } catch (error) {
    if (error instanceof PlanError) return error;
    throw error;
  }
  throw new Error('the plan loaded, but an error was expected');
}

function withStage(i: number, patch: Record<string, unknown>): Record<string, unknown> {
  const plan = fakePlan();
  const stages = [...(plan.stages as Record<string, unknown>[])];
  stages[i] = { ...stages[i], ...patch };
  return { ...plan, stages };
}

describe('loadPlanText: a good plan', () => {
  test('reads rails, op-amp defaults, uncertainty and stages in SI units', () => {
    const plan = load(fakePlan());
    expect(plan.plan).toBe('fake-1');
    expect(plan.rails.map((r) => [r.id, r.nominal, r.tol])).toEqual([
      ['+12V', 12, 0.01],
      ['-12V', -12, 0.01],
    ]);
    // The invented plan's "40 mA" in SI base units (BIPM SI Brochure, 9th ed., prefixes).
    expect(plan.idleCurrentMax).toBeCloseTo(0.04, 12);
    // Default threshold, common practice, no source.
    expect(plan.railShortMin).toBe(100);
    expect(plan.uncertainty.V).toEqual({ relative: 0.005, absolute: 0.002 });
    expect(plan.stages.map((s) => s.id)).toEqual(['ref', 'osc', 'amp']);
    expect(plan.stages[1]?.parts.C?.nominal).toBeCloseTo(100e-9, 20);
    expect(plan.stages[2]?.input).toEqual({ stage: 'osc', output: 'triangle' });
  });

  test('hash is the sha256 of the exact text (node:crypto as the reference)', () => {
    const text = JSON.stringify(fakePlan());
    const plan = loadPlanText(text, file, fakeKinds);
    expect(plan.hash).toBe(createHash('sha256').update(text).digest('hex'));
    expect(plan.text).toBe(text);
  });

  test('orders stages so every input comes first, otherwise keeping plan order', () => {
    const plan = fakePlan();
    const [ref, osc, amp] = plan.stages as unknown[];
    const loaded = load({ ...plan, stages: [amp, ref, osc] });
    const ids = loaded.stages.map((s) => s.id);
    // Depth-first from the plan order: amp pulls its input osc in front of it; ref keeps its place after.
    expect(ids).toEqual(['osc', 'amp', 'ref']);
  });

  test('a stage op-amp overrides the plan one key by key', () => {
    const loaded = load({ ...withStage(2, { opamp: { slew: '13 V/us' } }), opamp: { gbw: '3 MHz' } });
    // The stage's own opamp keys override the plan's (DESIGN §3), in SI base units: V/µs → V/s, MHz → Hz (BIPM prefixes).
    expect(loaded.stages[2]?.opamp.slew).toBeCloseTo(13e6, 3);
    expect(loaded.stages[2]?.opamp.gbw).toBeCloseTo(3e6, 3);
    expect(loaded.stages[0]?.opamp.slew).toBeCloseTo(0.5e6, 3);
  });

  test('per-check uncertainty takes the check unit', () => {
    const loaded = load({ ...fakePlan(), checkUncertainty: { 'osc.freq': '0.1% + 1 Hz' } });
    expect(loaded.checkUncertainty['osc.freq']).toEqual({ relative: 0.001, absolute: 1 });
  });
});

describe('loadPlanText: mistakes name the file, the JSON path and the remedy', () => {
  test('JSON syntax error gives line and column', () => {
    const text = '{\n  "plan": "x",\n  "title": "t"\n  "rails": []\n}';
    const e = errorOf(undefined, text);
    expect(e.message).toBe(`plan ${file}, line 4, column 3: not valid JSON; expected ',' or '}' after the property value`);
  });

  test('a trailing comma is located', () => {
    const e = errorOf(undefined, '{"plan": "x",\n}');
    expect(e.path).toBe('line 2, column 1');
  });

  test('unknown stage kind lists the known ones', () => {
    const e = errorOf(withStage(1, { kind: 'wien-bridge' }));
    expect(e.path).toBe('stages[1].kind');
    expect(e.message).toContain('unknown stage kind "wien-bridge"');
    expect(e.message).toContain('"divider", "gain", "osc"');
  });

  test('duplicate stage ids', () => {
    const e = errorOf(withStage(2, { id: 'osc' }));
    expect(e.path).toBe('stages[2].id');
    expect(e.message).toContain('duplicate stage id "osc" (also stages[1])');
  });

  test('unknown input stage lists the stages', () => {
    const e = errorOf(withStage(2, { input: 'shaper.out' }));
    expect(e.path).toBe('stages[2].input');
    expect(e.message).toContain('"shaper.out": unknown stage "shaper"; the stages are "ref", "osc", "amp"');
  });

  test('unknown input output lists the outputs', () => {
    const e = errorOf(withStage(2, { input: 'osc.sine' }));
    expect(e.message).toContain('unknown output "sine"; a osc stage has "osc.triangle", "osc.square"');
  });

  test('a loop of inputs', () => {
    const plan = fakePlan();
    const stages = [
      { id: 'a', kind: 'gain', input: 'b.out', parts: { Rg: '1k', Rf: '1k' } },
      { id: 'b', kind: 'gain', input: 'a.out', parts: { Rg: '1k', Rf: '1k' } },
    ];
    const e = errorOf({ ...plan, stages });
    expect(e.message).toContain('the inputs form a loop (a → b → a)');
  });

  test('a missing part (from the kind parse)', () => {
    const e = errorOf(withStage(1, { parts: { R: '10k 1%' } }));
    expect(e.path).toBe('stages[1].parts.C');
    expect(e.message).toContain('missing');
  });

  test('a tolerance of 100 % or more, and a negative one', () => {
    expect(errorOf(withStage(1, { parts: { R: '10k 100%', C: '100n' } })).message).toContain(
      'stages[1].parts.R: "10k 100%": a tolerance of 100 % or more is impossible',
    );
    expect(errorOf({ ...fakePlan(), rails: [{ id: '+12V', nominal: '12 V', tol: '-3%' }] }).message).toContain(
      'rails[0].tol: "-3%": a tolerance cannot be negative',
    );
  });

  test('a stage that needs an input has none', () => {
    const plan = withStage(2, {});
    const stages = plan.stages as Record<string, unknown>[];
    const { input: _input, ...rest } = stages[2] ?? {};
    const e = errorOf({ ...plan, stages: [stages[0], stages[1], rest] });
    expect(e.path).toBe('stages[2].input');
    expect(e.message).toContain('a gain stage needs an input');
  });

  test('a value in the wrong unit', () => {
    const e = errorOf({ ...fakePlan(), rails: [{ id: '+12V', nominal: '12 mA' }] });
    expect(e.message).toBe(`plan ${file}, rails[0].nominal: "12 mA" is a current; expected a voltage, e.g. "12 V"`);
  });

  test('a misspelt top-level key', () => {
    const plan = { ...fakePlan(), idelCurrent: { max: '40 mA' } };
    expect(errorOf(plan).message).toContain('unknown key "idelCurrent" (a typo?)');
  });

  test('a missing required key', () => {
    const { title: _t, ...plan } = fakePlan();
    const e = errorOf(plan);
    expect(e.path).toBe('title');
    expect(e.message).toContain('missing');
  });

  test('a test point for an output the kind does not have', () => {
    const e = errorOf(withStage(0, { testPoints: { tap: 'TP9' } }));
    expect(e.path).toBe('stages[0].testPoints.tap');
    expect(e.message).toContain('use one of "out", "out.dc"');
  });

  test('a divider fed from a rail the plan does not have lists the rails', () => {
    const e = errorOf(withStage(0, { from: '+5V' }));
    expect(e.path).toBe('stages[0].from');
    expect(e.message).toContain('"+5V" is not a rail of this plan; the rails are "+12V", "-12V"');
  });

  test('an unknown key inside a nested object lists the keys there', () => {
    const e = errorOf({ ...fakePlan(), uncertainty: { volts: '1%' } });
    expect(e.message).toContain('uncertainty: unknown key "volts" (a typo?); the keys here are V, A, Hz, ohm');
    expect(errorOf({ ...fakePlan(), rails: [{ id: '+12V', nominal: '12 V', tolerance: '1%' }] }).message).toContain(
      'the keys here are id, nominal, tol, testPoint',
    );
  });

  test('a per-check uncertainty for a check that does not exist', () => {
    const e = errorOf({ ...fakePlan(), checkUncertainty: { 'osc.frq': '1%' } });
    expect(e.message).toContain('no check "osc.frq" in this plan');
  });
});

describe('loadPlanFile', () => {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-plan-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  test('a missing file is a PlanError, not a stack trace', async () => {
    await expect(loadPlanFile(join(dir, 'none.plan.json'))).rejects.toThrow(/no such file/);
    await expect(loadPlanFile(join(dir, 'none.plan.json'))).rejects.toBeInstanceOf(PlanError);
  });

  test('a relative path resolves against cwd and is named as given', async () => {
    writeFileSync(join(dir, 'bad.plan.json'), '{');
    await expect(loadPlanFile('bad.plan.json', { cwd: dir })).rejects.toThrow(/^plan bad\.plan\.json, line 1, column 2: /);
  });
});
