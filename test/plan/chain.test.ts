import { describe, expect, test } from 'vitest';
import type { StageKind } from '../../src/circuit/types.js';
import { dc } from '../../src/circuit/waveform.js';
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
    expect(
      supplies([
        { id: '+5V', nominal: '5 V' },
        { id: '+15V', nominal: '15 V' },
        { id: '-5V', nominal: '-5 V' },
      ]),
    ).toEqual([15, -5]);
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

  test('a stage input impedance sees the sample rails (a rail-tied stage loads its source from its operating point)', () => {
    // A 1 V source behind 1 kΩ, and a taker whose input is (rail volts) kΩ: invented stand-ins.
    const source: StageKind<null> = {
      kind: 'src',
      summary: '1 V behind 1 kΩ',
      roles: [],
      outputs: ['out'],
      needsInput: false,
      parse: () => ({ parts: {}, settings: null }),
      checks: () => [{ key: 'out.dc', quantity: 'DC level', unit: 'V', output: 'out', instrument: 'meter', how: '' }],
      outputImpedance: () => ({ re: 1000, im: 0 }),
      evaluate: ({ load }) => {
        const z = load?.('out', 0);
        // Voltage divider: 1 V · Zl / (1 kΩ + Zl), resistive load.
        const v = z ? z.re / (1000 + z.re) : 1;
        return { outputs: { out: dc(v) }, values: { 'out.dc': v }, warnings: [] };
      },
      faultHints: {},
    };
    const taker: StageKind<null> = {
      kind: 'taker',
      summary: 'input set by a rail',
      roles: [],
      outputs: ['out'],
      needsInput: true,
      parse: () => ({ parts: {}, settings: null }),
      checks: () => [],
      inputImpedance: (x) => ({ re: 1000 * (x.rails?.['+12V'] ?? Number.NaN), im: 0 }),
      evaluate: () => ({ outputs: { out: dc(0) }, values: {}, warnings: [] }),
      faultHints: {},
    };
    const k = { ...fakeKinds, src: source as StageKind<unknown>, taker: taker as StageKind<unknown> };
    const plan = loadPlanText(
      JSON.stringify({
        plan: 'p',
        title: 't',
        rails: [{ id: '+12V', nominal: '12 V 5%' }],
        stages: [
          { id: 's', kind: 'src' },
          { id: 't', kind: 'taker', input: 's.out' },
        ],
      }),
      'p.plan.json',
      k,
    );
    const chain = buildChain(plan);
    // Hand arithmetic: 12 kΩ load on 1 kΩ: 12/13 V; at a 13.2 V rail 13.2/14.2 V.
    expect(chain.detail(chain.nominal).values['s.out.dc']).toBeCloseTo(12 / 13, 12);
    const x = Float64Array.from(chain.nominal);
    x[0] = 13.2;
    expect(chain.detail(x).values['s.out.dc']).toBeCloseTo(13.2 / 14.2, 12);
  });

  test('upstreamOf lists the input chain nearest first', () => {
    const plan = loadPlanText(JSON.stringify(fakePlan()), 'f.plan.json', fakeKinds);
    expect(upstreamOf(plan.stages, 'amp')).toEqual(['osc']);
    expect(upstreamOf(plan.stages, 'ref')).toEqual([]);
  });
});
