import { describe, expect, test } from 'vitest';
import type { StageKind } from '../../src/circuit/types.js';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanText } from '../../src/plan/load.js';
import { upstreamOf } from '../../src/plan/stages.js';
import { fakeKinds, fakePlan } from './fake-kinds.js';

/** A stage that reports the supplies and one rail it was given, to see what the chain feeds it. */
const probe: StageKind<null> = {
  kind: 'probe',
  summary: 'reports its supplies',
  roles: [],
  outputs: ['out'],
  needsInput: false,
  parse: () => ({ parts: {}, settings: null }),
  checks: () => [
    { key: 'pos', quantity: 'positive supply', unit: 'V', instrument: 'meter', how: '' },
    { key: 'neg', quantity: 'negative supply', unit: 'V', instrument: 'meter', how: '' },
  ],
  evaluate: ({ supplies }) => ({ outputs: {}, values: { pos: supplies.pos, neg: supplies.neg }, warnings: [] }),
  faultHints: {},
};
const kinds = { ...fakeKinds, probe: probe as StageKind<unknown> };

function supplies(rails: { id: string; nominal: string }[]) {
  const plan = loadPlanText(JSON.stringify({ plan: 'p', title: 't', rails, stages: [{ id: 'p', kind: 'probe' }] }), 'p.plan.json', kinds);
  const chain = buildChain(plan);
  const d = chain.detail(chain.nominal);
  return [d.values['p.pos'], d.values['p.neg']];
}

describe('buildChain', () => {
  test('op-amp supplies: the most positive and the most negative rail; ground when a side has none', () => {
    expect(supplies([{ id: '+5V', nominal: '5 V' }, { id: '+15V', nominal: '15 V' }, { id: '-5V', nominal: '-5 V' }])).toEqual([15, -5]);
    expect(supplies([{ id: '+9V', nominal: '9 V' }])).toEqual([9, 0]);
    expect(supplies([{ id: '-12V', nominal: '-12 V' }])).toEqual([0, -12]);
  });

  test('variables: rails first, then every part by <stage>.<role>, with tolerances as fractions', () => {
    const chain = buildChain(loadPlanText(JSON.stringify(fakePlan()), 'f.plan.json', fakeKinds));
    expect(chain.variables.map((v) => v.name)).toEqual(['rails.+12V', 'rails.-12V', 'ref.Rtop', 'ref.Rbottom', 'osc.R', 'osc.C', 'amp.Rg', 'amp.Rf']);
    // The invented plan's "100n 5%".
    expect(chain.variables.find((v) => v.name === 'osc.C')?.tol).toBeCloseTo(0.05, 12);
  });

  test('evaluate fills every check in order; a limited evaluation leaves later stages NaN', () => {
    const chain = buildChain(loadPlanText(JSON.stringify(fakePlan()), 'f.plan.json', fakeKinds));
    const out = new Float64Array(chain.checks.length);
    chain.evaluate(chain.nominal, out);
    const at = (id: string) => out[chain.checks.findIndex((c) => c.check === id)];
    // Closed forms of the fake stages: 12·10k/20k; 2 · (1 + 22k/10k).
    expect(at('ref.out.dc')).toBeCloseTo(6, 12);
    expect(at('amp.out.vpp')).toBeCloseTo(6.4, 12);
    expect(Number.isNaN(at('rails.+12V.to-ground'))).toBe(true);
    chain.evaluate(chain.nominal, out, chain.stageIndex('osc') + 1);
    // The fake oscillator's closed form f = 1/((R + 2.2 kΩ)·C), hand arithmetic.
    expect(at('osc.freq')).toBeCloseTo(1 / (12_200 * 100e-9), 6);
    expect(Number.isNaN(at('amp.out.vpp'))).toBe(true);
  });

  test('reusing the nominal upstream stages gives the same values as a full evaluation', () => {
    const chain = buildChain(loadPlanText(JSON.stringify(fakePlan()), 'f.plan.json', fakeKinds));
    const x = Float64Array.from(chain.nominal);
    x[chain.variables.findIndex((v) => v.name === 'amp.Rf')] = 33_000;
    const full = new Float64Array(chain.checks.length);
    const reused = new Float64Array(chain.checks.length);
    chain.evaluate(x, full);
    chain.evaluate(x, reused, undefined, chain.stageIndex('amp'));
    expect(Array.from(reused)).toEqual(Array.from(full));
  });

  test('upstreamOf lists the input chain nearest first', () => {
    const plan = loadPlanText(JSON.stringify(fakePlan()), 'f.plan.json', fakeKinds);
    expect(upstreamOf(plan.stages, 'amp')).toEqual(['osc']);
    expect(upstreamOf(plan.stages, 'ref')).toEqual([]);
  });
});
