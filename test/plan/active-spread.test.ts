import { readFile } from 'node:fs/promises';
import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { buildChain, spreadOf } from '../../src/plan/chain.js';
import { PlanError } from '../../src/plan/errors.js';
import { loadPlanText } from '../../src/plan/load.js';

/*
 * Active parts with spread (issue 11, item 3): op-amp keys with relative and
 * absolute tolerances, the offset as a ± maximum, the board temperature range,
 * and default spreads of diodes, zeners and transistors; all of them chain
 * variables. Invented values.
 */

function plan(extra: Record<string, unknown> = {}, stageOpamp?: Record<string, unknown>): string {
  return JSON.stringify({
    plan: 'spread-test',
    title: 'spread test (invented values)',
    rails: [
      { id: '+12V', nominal: '12 V', tol: '2%' },
      { id: '-12V', nominal: '-12 V', tol: '2%' },
    ],
    ...extra,
    stages: [
      { id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz' },
      { id: 'gain', kind: 'inverting-amp', input: 'in.out', parts: { Rin: '10k 1%', Rf: '33k 1%' }, ...(stageOpamp ? { opamp: stageOpamp } : {}) },
      { id: 'shaper', kind: 'diode-shaper', input: 'gain.out', parts: { Rs: '4k7 1%' }, branches: [{ diodes: 1, polarity: '+', R: '2k2 1%', bias: '0 V' }] },
    ],
  });
}

function errorOf(text: string): PlanError {
  try {
    loadPlanText(text, 'spread.plan.json');
  } catch (error) {
    if (error instanceof PlanError) return error;
    throw error;
  }
  throw new Error('the plan loaded, but an error was expected');
}

const byName = (text: string) => new Map(buildChain(loadPlanText(text, 'spread.plan.json')).variables.map((v) => [v.name, v] as const));

describe('op-amp keys with spread', () => {
  test('relative, absolute and ± maximum spreads become chain variables with their half-widths', () => {
    const vars = byName(plan({ opamp: { gbw: '1 MHz 30%', slew: '0.5 V/us 25%', headroom: '1.5 V 0.3 V', vos: '2 mV', ib: '80 nA 50%' } }));
    const half = (name: string): number => spreadOf(vars.get(name) ?? { name, stage: '', role: '', nominal: 0, tol: 0, unit: '1', text: '' });
    expect(vars.get('opamp.gbw')?.nominal).toBe(1e6);
    expect(half('opamp.gbw')).toBeCloseTo(0.3e6, 6);
    expect(half('opamp.slew')).toBeCloseTo(0.125e6, 6);
    expect(vars.get('opamp.headroom')?.nominal).toBe(1.5);
    expect(half('opamp.headroom')).toBeCloseTo(0.3, 12);
    expect(vars.get('opamp.vos')?.nominal).toBe(0);
    expect(half('opamp.vos')).toBeCloseTo(2e-3, 12);
    expect(half('opamp.ib')).toBeCloseTo(40e-9, 15);
    expect(vars.get('opamp.gbw')?.unit).toBe('Hz');
  });

  test('"1.5 V ±0.3 V" reads as 1.5 V ± 0.3 V', () => {
    const vars = byName(plan({ opamp: { headroom: '1.5 V ±0.3 V' } }));
    expect(spreadOf(vars.get('opamp.headroom') ?? { name: '', stage: '', role: '', nominal: 0, tol: 0, unit: 'V', text: '' })).toBeCloseTo(0.3, 12);
  });

  test('a plan without op-amp spreads varies only the default offset (±5 mV), and only at op-amp stages', () => {
    const vars = byName(plan());
    expect([...vars.keys()].filter((n) => n.startsWith('opamp.'))).toEqual(['opamp.vos']);
    expect(spreadOf(vars.get('opamp.vos') ?? { name: '', stage: '', role: '', nominal: 0, tol: 0, unit: 'V', text: '' })).toBeCloseTo(5e-3, 12);
  });

  test('a stage with its own op-amp is a different part: its spreads are its own variables', () => {
    const vars = byName(plan({ opamp: { gbw: '1 MHz 30%' } }, { gbw: '10 MHz 20%' }));
    expect(vars.get('gain.opamp.gbw')?.nominal).toBe(10e6);
    // Only the plan's op-amp stages use the plan's variable; here none is left.
    expect(vars.has('opamp.gbw')).toBe(false);
  });

  test('the sampled gbw reaches the stage: gain.bw spreads with it, by GBW/(1 + Rf/Rin) (Sedra and Smith)', () => {
    const set = computeTargets(loadPlanText(plan({ opamp: { gbw: '1 MHz 30%' } }), 'spread.plan.json'), { trials: 400 });
    const bw = set.targets.find((t) => t.check === 'gain.bw');
    // Worst case, closed form: GBW·(1 + 0.3)·(1/NG + 1/aol) at the least noise gain NG = 1 + 33k·0.99/(10k·1.01); within 1 Hz.
    const ng = 1 + (33e3 * 0.99) / (10e3 * 1.01);
    expect(Math.abs((bw?.worst.max ?? 0) - 1.3e6 * (1 / ng + 1 / 2e5))).toBeLessThan(1);
    expect((bw?.worst.max ?? 0) / (bw?.nominal ?? 1)).toBeGreaterThan(1.29);
  });

  test('bad op-amp values name the path and the remedy', () => {
    expect(errorOf(plan({ opamp: { vos: '2 mV 10%' } })).message).toMatch(/opamp\.vos.*± maximum/);
    expect(errorOf(plan({ opamp: { headroom: '1.5 V 2 V' } })).message).toMatch(/opamp\.headroom.*as large as the value/);
    expect(errorOf(plan({ opamp: { gbw: '1 MHz lots' } })).message).toMatch(/opamp\.gbw/);
    expect(errorOf(plan({ opamp: { maxSupply: '15 V 5%' } })).message).toMatch(/opamp\.maxSupply.*limit/);
    expect(errorOf(plan({ opamp: { offset: '2 mV' } })).message).toMatch(/unknown key "offset".*vos/);
  });
});

describe('temperature range', () => {
  test('becomes the variable `temperature`, kelvin, centred on the midpoint', () => {
    const t = byName(plan({ temperature: { min: '15 °C', max: '40 °C' } })).get('temperature');
    expect(t?.nominal).toBeCloseTo(273.15 + 27.5, 9);
    expect(spreadOf(t ?? { name: '', stage: '', role: '', nominal: 0, tol: 0, unit: 'K', text: '' })).toBeCloseTo(12.5, 9);
    expect(t?.unit).toBe('K');
  });

  test('widens the shaper band (the diode drop moves about −2 mV/K, common practice)', () => {
    const cold = computeTargets(loadPlanText(plan(), 'a.plan.json'), { trials: 200 }).targets.find((x) => x.check === 'shaper.out.vpp');
    const warm = computeTargets(loadPlanText(plan({ temperature: { min: '0 °C', max: '70 °C' } }), 'b.plan.json'), { trials: 200 }).targets.find(
      (x) => x.check === 'shaper.out.vpp',
    );
    expect((warm?.worst.max ?? 0) - (warm?.worst.min ?? 0)).toBeGreaterThan((cold?.worst.max ?? 0) - (cold?.worst.min ?? 0));
  });

  test('bad ranges are plan errors', () => {
    expect(errorOf(plan({ temperature: { min: '40 °C', max: '15 °C' } })).message).toMatch(/temperature.*below min/);
    expect(errorOf(plan({ temperature: { min: 'cold', max: '15 °C' } })).message).toMatch(/temperature\.min.*not a temperature/);
    expect(errorOf(plan({ temperature: { min: '15 °C', max: '400 °C' } })).message).toMatch(/temperature\.max.*125/);
  });
});

describe('default spreads of active parts', () => {
  test('diode IS ±50 % and N ±2 %, zener vz ±5 %, hfe ±50 % when the plan gives none', async () => {
    const demo = loadPlanText(await readFile('demo/exciter.plan.json', 'utf8'), 'demo/exciter.plan.json');
    const vars = new Map(buildChain(demo).variables.map((v) => [v.name, v] as const));
    expect(vars.get('shaper.diode.is')?.tol).toBe(0.5);
    expect(vars.get('shaper.diode.n')?.tol).toBe(0.02);
    expect(vars.get('drive.hfe')?.tol).toBe(0.5);
    // The demo writes its zener's tolerance (5 %); it is kept.
    expect(vars.get('osc.clamp.vz')?.tol).toBe(0.05);
  });

  test('old plans keep their nominal targets: every added variable is centred on the value the stage used before', async () => {
    const demo = loadPlanText(await readFile('demo/exciter.plan.json', 'utf8'), 'demo/exciter.plan.json');
    const chain = buildChain(demo);
    const vars = new Map(chain.variables.map((v) => [v.name, v] as const));
    const table = JSON.parse(await readFile('data/diode-models.json', 'utf8')) as { models: Record<string, { is: number; n: number }> };
    // The shaper's diodes at the shipped 1N4148 values, the offset at 0, no temperature without a range (27 °C as before).
    expect(vars.get('shaper.diode.is')?.nominal).toBe(table.models['1N4148']?.is);
    expect(vars.get('shaper.diode.n')?.nominal).toBe(table.models['1N4148']?.n);
    expect(vars.get('opamp.vos')?.nominal).toBe(0);
    expect(vars.has('temperature')).toBe(false);
    // The DC level at the amplifier's output is the input's mean times the gain: the shaper's output is symmetric (≈ 0).
    const d = chain.detail(chain.nominal);
    expect(Math.abs(d.values['gain.out.dc'] ?? 1)).toBeLessThan(1e-6);
  });
});

describe('hostile op-amp values', () => {
  test('a value of 100,000 words is refused with its path and the length limit', () => {
    const long = `1.5 V ${'x '.repeat(100_000)}`;
    expect(errorOf(plan({ opamp: { headroom: long } })).message).toMatch(/opamp\.headroom.*too long/);
    expect(errorOf(plan({ temperature: { min: `${'1'.repeat(300)} °C`, max: '40 °C' } })).message).toMatch(/temperature\.min.*not a temperature/);
  });
});
