import { describe, expect, test } from 'vitest';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanText } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { corner, runSpice } from '../helpers/ngspice.js';
import { node, planDeck } from '../helpers/plan-deck.js';

/*
 * Stages that load each other, against ngspice (Debian package): every plan here
 * is invented for the test, turned into a deck by test/helpers/plan-deck.ts (its
 * models stated there), and each check compared with the same figure measured
 * in the simulation: peak-to-peak over the last two of six periods of a
 * transient, a −3 dB corner from an AC sweep with the next stage connected, a
 * DC level from an operating point. 2 % unless said otherwise.
 */

const rails = [
  { id: '+12V', nominal: '12 V', tol: '2%' },
  { id: '-12V', nominal: '-12 V', tol: '2%' },
];
const opamp = { gbw: '3 MHz', slew: '5 V/us', headroom: '1.2 V' };

function plan(stages: unknown[], name = 'loaded-test'): Plan {
  return loadPlanText(JSON.stringify({ plan: name, title: 'invented test board', rails, opamp, stages }), `${name}.plan.json`);
}

function nominal(p: Plan): Record<string, number> {
  const chain = buildChain(p);
  const d = chain.detail(chain.nominal);
  expect(d.failures).toEqual([]);
  return d.values;
}

/** Peak-to-peak of stage outputs over the last two of six periods of a transient of the whole deck. */
function spiceVpp(p: Plan, frequency: number, outputs: readonly string[]): Record<string, number> {
  const period = 1 / frequency;
  const names = outputs.map((o) => `v(${node(o.split('.')[0] as string, o.split('.')[1] as string)})`);
  const t = runSpice(planDeck(p), `tran ${period / 2000} ${6 * period} 0 ${period / 2000}`, names);
  const time = t['time'] as Float64Array;
  const out: Record<string, number> = {};
  outputs.forEach((o, k) => {
    const v = t[names[k] as string] as Float64Array;
    let hi = -Infinity;
    let lo = Infinity;
    for (let i = 0; i < time.length; i++) {
      if ((time[i] as number) < 4 * period) continue;
      hi = Math.max(hi, v[i] as number);
      lo = Math.min(lo, v[i] as number);
    }
    out[o] = hi - lo;
  });
  return out;
}

/** −3 dB corner of `stage`'s output with its input driven (AC 1) and everything downstream connected. */
function spiceCorner(p: Plan, stage: string): number {
  const t = runSpice(planDeck(p, { from: stage, drive: 'DC 0 AC 1' }), 'ac dec 400 10 10meg', [`vm(${node(stage, 'out')})`]);
  return corner(t['frequency'] as Float64Array, t[`vm(${node(stage, 'out')})`] as Float64Array);
}

const rel = (a: number, b: number): number => Math.abs(a / b - 1);

describe('RC low-pass into an inverting amplifier (R 1k…22k, Rin 1k…100k)', () => {
  const cases = [
    { r: '1k', c: '47n', rin: '1k' },
    { r: '1k', c: '47n', rin: '100k' },
    { r: '4k7', c: '10n', rin: '10k' },
    { r: '22k', c: '2n2', rin: '1k' },
    { r: '22k', c: '2n2', rin: '100k' },
  ];
  for (const c of cases) {
    test(`R ${c.r}, C ${c.c}, Rin ${c.rin}: stage alone and loaded`, () => {
      const source = { id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '2 kHz' };
      const filt = { id: 'filt', kind: 'rc-lowpass', input: 'in.out', parts: { R: c.r, C: c.c } };
      const amp = { id: 'amp', kind: 'inverting-amp', input: 'filt.out', parts: { Rin: c.rin, Rf: '3k3' } };
      // Alone: the textbook single pole (fc = 1/(2πRC)) and ngspice agree.
      const alone = plan([source, filt]);
      const a = nominal(alone);
      expect(rel(a['filt.out.vpp'] as number, spiceVpp(alone, 2000, ['filt.out'])['filt.out'] as number)).toBeLessThan(0.02);
      expect(rel(a['filt.fc'] as number, spiceCorner(alone, 'filt'))).toBeLessThan(0.02);
      // Together: the amplifier's Rin loads the filter.
      const both = plan([source, filt, amp]);
      const v = nominal(both);
      const s = spiceVpp(both, 2000, ['filt.out', 'amp.out']);
      expect(rel(v['filt.out.vpp'] as number, s['filt.out'] as number)).toBeLessThan(0.02);
      expect(rel(v['amp.out.vpp'] as number, s['amp.out'] as number)).toBeLessThan(0.02);
      expect(rel(v['filt.fc'] as number, spiceCorner(both, 'filt'))).toBeLessThan(0.02);
    });
  }
});

describe('other loaded chains', () => {
  test('a divider tap into an inverting amplifier (DC): the tap sags as ngspice says', () => {
    const p = plan([
      { id: 'ref', kind: 'divider', from: '+12V', parts: { Rtop: '10k', Rbottom: '4k7' } },
      { id: 'amp', kind: 'inverting-amp', input: 'ref.out', parts: { Rin: '4k7', Rf: '4k7' } },
    ]);
    const chain = buildChain(p);
    const d = chain.detail(chain.nominal);
    const op = runSpice(planDeck(p), 'op', [`v(${node('ref', 'out')})`, `v(${node('amp', 'out')})`]);
    const tap = op[`v(${node('ref', 'out')})`]?.[0] as number;
    // Unloaded it would be 12·4.7/14.7 = 3.84 V; Rin 4k7 to a virtual ground pulls it to about 2.53 V.
    expect(tap).toBeLessThan(3);
    expect(rel(d.values['ref.out.dc'] as number, tap)).toBeLessThan(0.002);
    expect(rel(d.outputs['amp.out']?.samples[0] as number, op[`v(${node('amp', 'out')})`]?.[0] as number)).toBeLessThan(0.002);
  });

  test('a shaper output into an inverting amplifier: the amplifier input loads the shaper node', () => {
    const stages = [
      { id: 'in', kind: 'signal-in', shape: 'triangle', peak: '4 V', frequency: '1 kHz' },
      {
        id: 'shaper',
        kind: 'diode-shaper',
        input: 'in.out',
        parts: { Rs: '4k7' },
        branches: [
          { diodes: 1, polarity: '+', R: '2k2', bias: '0.5 V' },
          { diodes: 1, polarity: '-', R: '2k2', bias: '-0.5 V' },
        ],
      },
      { id: 'amp', kind: 'inverting-amp', input: 'shaper.out', parts: { Rin: '4k7', Rf: '10k' } },
    ];
    const alone = plan(stages.slice(0, 2));
    const both = plan(stages);
    const a = nominal(alone);
    const v = nominal(both);
    const s = spiceVpp(both, 1000, ['shaper.out', 'amp.out']);
    // The load is not negligible here: the loaded shaper swings visibly less than alone.
    expect((v['shaper.out.vpp'] as number) / (a['shaper.out.vpp'] as number)).toBeLessThan(0.9);
    expect(rel(v['shaper.out.vpp'] as number, s['shaper.out'] as number)).toBeLessThan(0.02);
    expect(rel(v['amp.out.vpp'] as number, s['amp.out'] as number)).toBeLessThan(0.02);
  });

  test('an RC low-pass into a diode-biased follower (bias network and load seen through the bases)', () => {
    const p = plan([
      { id: 'in', kind: 'signal-in', shape: 'sine', peak: '3 V', frequency: '3 kHz' },
      { id: 'filt', kind: 'rc-lowpass', input: 'in.out', parts: { R: '2k2', C: '10n' } },
      {
        id: 'drive',
        kind: 'push-pull',
        input: 'filt.out',
        bias: 'diodes',
        parts: { Rload: '1k', Rb1: '10k', Rb2: '10k' },
        vbe: '0.66 V',
        hfe: 120,
        pnp: { vbe: '0.69 V', hfe: 150 },
      },
    ]);
    const v = nominal(p);
    const s = spiceVpp(p, 3000, ['filt.out', 'drive.out']);
    expect(rel(v['filt.out.vpp'] as number, s['filt.out'] as number)).toBeLessThan(0.02);
    // Follower amplitude: 5 % (issue 11's allowance); it lands within 2 % here.
    expect(rel(v['drive.out.vpp'] as number, s['drive.out'] as number)).toBeLessThan(0.02);
    expect(rel(v['filt.fc'] as number, spiceCorner(p, 'filt'))).toBeLessThan(0.02);
  });

  test.each([
    ['50 Ω', '50 ohm 1%', '100 ohm'],
    ['600 Ω', '600 ohm 1%', '1k'],
  ])('a %s generator into a low input impedance: the connector reads what ngspice reads', (_name, source, rin) => {
    // Gain kept below clipping: a clipped inverting stage loses its virtual ground and stops loading as Rin.
    const p = plan([
      { id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz', source },
      { id: 'amp', kind: 'inverting-amp', input: 'in.out', parts: { Rin: rin, Rf: '1k' } },
    ]);
    const v = nominal(p);
    const s = spiceVpp(p, 1000, ['in.out', 'amp.out']);
    // The open-circuit 2 Vpp divided by Rs and Rin.
    expect(v['in.out.vpp'] as number).toBeLessThan(1.9);
    expect(rel(v['in.out.vpp'] as number, s['in.out'] as number)).toBeLessThan(0.02);
    expect(rel(v['amp.out.vpp'] as number, s['amp.out'] as number)).toBeLessThan(0.02);
  });

  test('an external load named in the plan (a 600 Ω line on a generator with 600 Ω source): half the open-circuit level', () => {
    const p = plan([{ id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz', source: '600 ohm', loads: { out: '600 ohm' } }]);
    const v = nominal(p);
    const s = spiceVpp(p, 1000, ['in.out']);
    // Equal source and load: a divider of one half (Ohm's law), 1 Vpp.
    expect(v['in.out.vpp'] as number).toBeCloseTo(1, 6);
    expect(rel(v['in.out.vpp'] as number, s['in.out'] as number)).toBeLessThan(0.02);
  });

  test('negligible loading: an RC low-pass into a non-inverting input keeps its textbook corner and level', () => {
    const source = { id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '10 kHz' };
    const filt = { id: 'filt', kind: 'rc-lowpass', input: 'in.out', parts: { R: '10k', C: '1n5' } };
    const amp = { id: 'amp', kind: 'noninverting-amp', input: 'filt.out', parts: { Rg: '10k', Rf: '10k' } };
    const alone = nominal(plan([source, filt]));
    const both = plan([source, filt, amp]);
    const v = nominal(both);
    // fc = 1/(2π·10k·1n5) = 10.61 kHz (any circuits handbook): the model adds no loading of its own.
    expect(v['filt.fc'] as number).toBeCloseTo(1 / (2 * Math.PI * 10e3 * 1.5e-9), 6);
    expect(v['filt.out.vpp']).toBe(alone['filt.out.vpp']);
    const s = spiceVpp(both, 10_000, ['filt.out']);
    expect(rel(v['filt.out.vpp'] as number, s['filt.out'] as number)).toBeLessThan(0.02);
    expect(rel(v['filt.fc'] as number, spiceCorner(both, 'filt'))).toBeLessThan(0.02);
  });
});

describe('a ladder of RC low-passes, each loading the one before (invented values)', () => {
  // Six sections with values of their own, so no two corners coincide; the last one unloaded.
  const sections = [
    { R: '1k', C: '10n' },
    { R: '2k2', C: '4n7' },
    { R: '680', C: '22n' },
    { R: '4k7', C: '2n2' },
    { R: '1k5', C: '6n8' },
    { R: '3k3', C: '3n3' },
  ];
  const source = { id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '3 kHz' };
  const stages = [source, ...sections.map((parts, i) => ({ id: `f${i}`, kind: 'rc-lowpass', input: i === 0 ? 'in.out' : `f${i - 1}.out`, parts }))];
  const p = plan(stages, 'ladder');

  test('every corner (AC sweep, everything downstream connected) and every level (transient) as ngspice says', () => {
    const v = nominal(p);
    const ids = sections.map((_, i) => `f${i}`);
    const s = spiceVpp(
      p,
      3000,
      ids.map((id) => `${id}.out`),
    );
    for (const id of ids) {
      expect(rel(v[`${id}.out.vpp`] as number, s[`${id}.out`] as number)).toBeLessThan(0.02);
      expect(rel(v[`${id}.fc`] as number, spiceCorner(p, id))).toBeLessThan(0.02);
    }
  });

  test('the loads remembered per sample never outlive it: moving one part and back gives the first figures bit for bit', () => {
    const chain = buildChain(p);
    const first = new Float64Array(chain.checks.length);
    const moved = new Float64Array(chain.checks.length);
    const again = new Float64Array(chain.checks.length);
    chain.evaluate(chain.nominal, first);
    const x = Float64Array.from(chain.nominal);
    // The last section's C: it reaches every stage's load.
    const at = chain.variables.findIndex((v) => v.name === 'f5.C');
    x[at] = (x[at] as number) * 1.05;
    chain.evaluate(x, moved);
    chain.evaluate(chain.nominal, again);
    expect(Array.from(again)).toEqual(Array.from(first));
    // The first section's corner felt the move at the far end of the ladder (a stale load would not).
    const fc0 = chain.checks.findIndex((c) => c.check === 'f0.fc');
    expect(moved[fc0]).not.toBe(first[fc0]);
    // And a chain built afresh at the moved point agrees with the one that moved.
    const fresh = buildChain(p);
    const out = new Float64Array(fresh.checks.length);
    fresh.evaluate(x, out);
    expect(Array.from(out)).toEqual(Array.from(moved));
  });
});

describe('plan keys for loading', () => {
  test('an external load on an output the stage does not have is a plan error naming the path', () => {
    expect(() => plan([{ id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz', loads: { line: '600 ohm' } }])).toThrow(
      /stages\[0\]\.loads\.line: "line" is not an output of a signal-in stage/,
    );
    expect(() => plan([{ id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz', loads: { out: '600 V' } }])).toThrow(
      /stages\[0\]\.loads\.out/,
    );
    expect(() => plan([{ id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz', source: '-50 ohm' }])).toThrow(/stages\[0\]\.source/);
  });

  test('the external load is a toleranced part of its stage (it enters the bands)', () => {
    const p = plan([{ id: 'in', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz', source: '600 ohm', loads: { out: '600 ohm 10%' } }]);
    const chain = buildChain(p);
    expect(chain.variables.find((x) => x.name === 'in.loads.out')?.tol).toBeCloseTo(0.1, 12);
  });
});
