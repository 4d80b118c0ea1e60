// A new stage kind says what the rest of the code needs to know through its
// traits (STYLE 21): registered only in the kinds table handed to the loader,
// with no line anywhere else, it gets the op-amp supply check, the bandwidth
// checks of an amplifier, the rail check of its rail setting, and the
// no-contributors rule of a hand-written target. All values are invented.
import { describe, expect, test } from 'vitest';
import { explainReading } from '../../src/analysis/explain.js';
import { computeTargets } from '../../src/analysis/targets.js';
import { stageKinds } from '../../src/circuit/registry.js';
import type { StageKind, StageTraits } from '../../src/circuit/types.js';
import { dc } from '../../src/circuit/waveform.js';
import { PlanError } from '../../src/plan/errors.js';
import { loadPlanText } from '../../src/plan/load.js';

/** Output = input · G (G a dimensionless part), with a bandwidth of 1 kHz: a kind no code outside this file knows. */
function widget(traits: StageTraits): StageKind<{ supply?: string }> {
  return {
    kind: 'widget',
    summary: 'test widget',
    traits,
    roles: [{ role: 'G', unit: '1', description: 'gain' }],
    outputs: ['out'],
    needsInput: true,
    parse(raw) {
      const json = raw.json as Record<string, unknown>;
      const g = Number(json.gain ?? 2);
      return { parts: { G: { nominal: g, tol: 0.05, unit: '1', text: String(g) } }, settings: typeof json.supply === 'string' ? { supply: json.supply } : {} };
    },
    checks: () => [
      { key: 'out.vpp', quantity: 'peak-to-peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope' },
      { key: 'bw', quantity: 'bandwidth', unit: 'Hz', instrument: 'scope', how: 'scope' },
    ],
    evaluate({ parts, input }) {
      const g = parts.G ?? 1;
      const src = input ?? dc(0);
      const samples = Float64Array.from(src.samples, (v) => v * g);
      let lo = Infinity;
      let hi = -Infinity;
      for (const v of samples) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
      return { outputs: { out: { frequency: src.frequency, samples } }, values: { 'out.vpp': hi - lo, bw: 1000 }, warnings: [] };
    },
    faultHints: {},
  };
}

/** ±18 V rails over a 15 V op-amp ceiling, a 5 kHz 1 V sine into the widget (invented values). */
function planText(extra: Record<string, unknown> = {}): string {
  return JSON.stringify({
    plan: 'traits',
    title: 'trait test (invented values)',
    rails: [
      { id: '+18V', nominal: '18 V', tol: '1%' },
      { id: '-18V', nominal: '-18 V', tol: '1%' },
    ],
    idleCurrent: { max: '20 mA' },
    opamp: { gbw: '1 MHz', slew: '0.5 V/us', headroom: '1.5 V', maxSupply: '15 V' },
    stages: [
      { id: 'gen', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '5 kHz' },
      { id: 'w', kind: 'widget', input: 'gen.out', gain: 20, ...extra },
    ],
  });
}

const load = (traits: StageTraits, extra: Record<string, unknown> = {}) =>
  loadPlanText(planText(extra), 'traits.plan.json', { ...stageKinds, widget: widget(traits) as StageKind<unknown> });
const messagesFor = (traits: StageTraits) =>
  computeTargets(load(traits), { trials: 100 })
    .warnings.filter((w) => w.stage === 'w')
    .map((w) => w.message);

describe('stage traits: a kind known only to the registry', () => {
  test('usesOpamp brings the supply-ceiling warning; without it there is none', () => {
    expect(messagesFor({ usesOpamp: true }).some((m) => m.includes('supply ceiling'))).toBe(true);
    expect(messagesFor({}).some((m) => m.includes('supply ceiling'))).toBe(false);
  });

  test('isAmplifier brings the full-power and small-signal bandwidth warnings', () => {
    // 20 V peak out at 5 kHz: SR/(2π·Vpeak) = 0.5 V/µs / (2π·20 V) ≈ 4 kHz (Sedra and Smith, full-power bandwidth), below 5 kHz.
    const on = messagesFor({ isAmplifier: true });
    expect(on.some((m) => m.includes('full-power bandwidth'))).toBe(true);
    expect(on.some((m) => m.includes('closed-loop bandwidth'))).toBe(true);
    expect(messagesFor({}).some((m) => m.includes('bandwidth'))).toBe(false);
  });

  test('railSetting names the key the loader checks against the rails', () => {
    expect(() => load({ railSetting: 'supply' }, { supply: '+15V' })).toThrow(PlanError);
    expect(() => load({ railSetting: 'supply' }, { supply: '+15V' })).toThrow(/stages\[1\]\.supply: "\+15V" is not a rail of this plan/);
    expect(() => load({ railSetting: 'supply' }, { supply: '+18V' })).not.toThrow();
    // Without the trait the key is the kind's own business.
    expect(() => load({}, { supply: '+15V' })).not.toThrow();
  });

  test('isHandWritten: no part contributes to its band and none explains a deviation', () => {
    const hand = computeTargets(load({ isHandWritten: true }), { trials: 100 }).targets.find((t) => t.check === 'w.out.vpp');
    const modelled = computeTargets(load({}), { trials: 100 }).targets.find((t) => t.check === 'w.out.vpp');
    expect(hand?.contributors).toEqual([]);
    expect(modelled?.contributors.map((c) => c.part)).toContain('w.G');
    expect(explainReading(load({ isHandWritten: true }), 'w.out.vpp', 50).filter((e) => e.part.startsWith('w.'))).toEqual([]);
    expect(explainReading(load({}), 'w.out.vpp', 50).some((e) => e.part === 'w.G')).toBe(true);
  });

  test('every registered kind declares its traits', () => {
    for (const [name, kind] of Object.entries(stageKinds)) expect(kind.traits, name).toBeDefined();
    expect(stageKinds['divider']?.traits?.railSetting).toBe('from');
    expect(stageKinds['manual']?.traits?.isHandWritten).toBe(true);
    expect(stageKinds['inverting-amp']?.traits).toMatchObject({ usesOpamp: true, isAmplifier: true });
    expect(stageKinds['schmitt-integrator']?.traits).toMatchObject({ usesOpamp: true, isAmplifier: false });
  });
});
