import { describe, expect, test } from 'vitest';
import { regulatorKind, type RegulatorSettings } from '../../src/circuit/regulator.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';
import { formatValue } from '../../src/units/format.js';
import type { Complex, StageFault } from '../../src/circuit/types.js';
import { runSpice } from '../helpers/ngspice.js';

function stage(json: Record<string, unknown>) {
  return regulatorKind.parse({ json, path: 'stages[2]' }, 'x.plan.json');
}

function run(
  json: Record<string, unknown>,
  rails: Record<string, number>,
  extra: { fault?: StageFault; load?: (o: string, f: number) => Complex | undefined } = {},
) {
  const s = stage(json);
  const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
  return regulatorKind.evaluate({ parts, settings: s.settings, opamp: defaultOpamp, supplies: { pos: 15, neg: -15 }, rails, ...extra });
}

/**
 * The regulator in ngspice, stated as a behavioural model independent of the
 * TypeScript form: an ideal error loop holds V(out) − V(adj) at vref (the
 * mirror image for a negative one), the adjust pin sources iadj into the node
 * R1/R2, and the pass element cannot bring the output closer than `dropout`
 * to the input. ngspice solves the R1/R2/iadj network and the load itself.
 */
function spiceRegulator(o: { vin: number; r1: number; r2: number; vref: number; iadj: number; dropout: number; rload?: number; negative?: boolean }): number {
  const out = o.negative
    ? `Breg out 0 V = max(V(adj) - ${o.vref}, V(in) + ${o.dropout})\nIadj adj 0 DC ${o.iadj}`
    : `Breg out 0 V = min(V(adj) + ${o.vref}, V(in) - ${o.dropout})\nIadj 0 adj DC ${o.iadj}`;
  const deck = [`Vin in 0 DC ${o.vin}`, out, `R1 out adj ${o.r1}`, `R2 adj 0 ${o.r2}`, o.rload ? `Rl out 0 ${o.rload}` : ''].join('\n');
  const t = runSpice(deck, 'op', ['v(out)']);
  return (t['v(out)'] as Float64Array)[0] as number;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('regulator against ngspice (behavioural error loop, stated above)', () => {
  test.each([
    // [case, rail, R1, R2, polarity]
    ['5 V from 12 V', 12, 240, 720, '+'],
    ['12.03 V from 15 V, just out of dropout (2.97 V of input-output margin against the 2 V dropout)', 15, 240, 2.05e3, '+'],
    ['11.8 V wanted from 13 V: in dropout, follows 13 − 2 V', 13, 240, 2.05e3, '+'],
    ['negative: −12 V from −15 V', -15, 120, 1.02e3, '-'],
    ['negative in dropout: −9.6 V wanted from −11 V', -11, 120, 800, '-'],
  ] as const)('%s', (_name, vin, r1, r2, polarity) => {
    const json = { from: 'VIN', polarity, parts: { R1: `${r1}`, R2: `${r2}` } };
    const got = run(json, { VIN: vin }).values['out.dc'] as number;
    const spice = spiceRegulator({ vin, r1, r2, vref: 1.25, iadj: 50e-6, dropout: 2, negative: polarity === '-' });
    // ngspice operating point: DC levels within 2 % (the tolerance); the forms agree to far better.
    expect(rel(got, spice)).toBeLessThan(0.02);
    expect(rel(got, spice)).toBeLessThan(1e-6);
  });

  test('a load on the output leaves a regulated output where it is', () => {
    const json = { from: 'VIN', parts: { R1: '240', R2: '720' } };
    const load = (o: string) => (o === 'out' ? { re: 100, im: 0 } : undefined);
    const loaded = run(json, { VIN: 12 }, { load });
    const spice = spiceRegulator({ vin: 12, r1: 240, r2: 720, vref: 1.25, iadj: 50e-6, dropout: 2, rload: 100 });
    // ngspice operating point with a 100 Ω load: within 2 %.
    expect(rel(loaded.values['out.dc'] as number, spice)).toBeLessThan(0.02);
    expect(loaded.warnings).toEqual([]);
    // Dissipation by hand: (12 − 5.036 V) × (5.036/960 + 5.036/100) A = 0.3872 W.
    expect(loaded.values['pdiss']).toBeCloseTo((12 - 5.036) * (5.036 / 960 + 5.036 / 100), 3);
    expect(
      regulatorKind.checks(stage({ from: 'VIN', parts: { R1: '240', R2: '720' } }).settings as RegulatorSettings).find((c) => c.key === 'pdiss')
        ?.isDesignFigure,
    ).toBe(true);
  });
});

describe('regulator closed form and warnings', () => {
  test('data-sheet worked example: R1 = 240 Ω, R2 = 720 Ω gives 1.25·(1 + 3) + 50 µA·720 Ω = 5.036 V', () => {
    // Adjustable three-terminal regulator data sheets: Vout = Vref(1 + R2/R1) + Iadj·R2 (form from memory), by hand.
    expect(run({ from: 'VIN', parts: { R1: '240', R2: '720' } }, { VIN: 12 }).values['out.dc']).toBeCloseTo(5.036, 9);
  });

  test('dropout warns and names the input', () => {
    const r = run({ from: 'VIN', parts: { R1: '240', R2: '2k05' } }, { VIN: 13 });
    expect(r.values['out.dc']).toBeCloseTo(11, 9);
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/in dropout.*13 V/);
    expect(run({ from: 'VIN', parts: { R1: '240', R2: '720' } }, { VIN: 12 }).warnings).toEqual([]);
  });

  test('fixed regulators, positive and negative, and their dropout', () => {
    expect(run({ from: 'VIN', vout: '5 V 4%' }, { VIN: 9 }).values['out.dc']).toBe(5);
    expect(run({ from: 'VIN', vout: '5 V 4%' }, { VIN: 6.5 }).values['out.dc']).toBeCloseTo(4.5, 12);
    expect(run({ from: 'VIN', vout: '-5 V' }, { VIN: -9 }).values['out.dc']).toBe(-5);
    expect(run({ from: 'VIN', vout: '-5 V', dropout: '1.1 V' }, { VIN: -5.5 }).values['out.dc']).toBeCloseTo(-4.4, 12);
  });

  test('a large divider warns of the minimum load; a hot regulator warns of burns', () => {
    const r = run({ from: 'VIN', parts: { R1: '2k4', R2: '7k2' } }, { VIN: 12 });
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/few mA/);
    const hot = run({ from: 'VIN', parts: { R1: '240', R2: '720' } }, { VIN: 24 }, { load: () => ({ re: 20, im: 0 }) });
    // Dissipation by hand: (24 − 5.036 V) × (5.036/960 + 5.036/20) A = 4.875 W.
    const v = 5.036;
    expect(hot.warnings.map((w) => w.message).join('\n')).toContain(
      `dissipates ${formatValue((24 - v) * (v / 960 + v / 20), 'W')}: it runs hot enough to burn a finger`,
    );
  });

  test('fault modes: R2 shorted reads the reference, R1 open or shorted and R2 open rise to the input less the dropout', () => {
    const json = { from: 'VIN', parts: { R1: '240', R2: '720' } };
    expect(run(json, { VIN: 12 }, { fault: { role: 'R2', mode: 'short' } }).values['out.dc']).toBeCloseTo(1.25, 12);
    for (const fault of [
      { role: 'R1', mode: 'open' },
      { role: 'R1', mode: 'short' },
      { role: 'R2', mode: 'open' },
    ] as const) {
      expect(run(json, { VIN: 12 }, { fault }).values['out.dc']).toBeCloseTo(10, 12);
    }
    expect(regulatorKind.faults?.(stage(json).settings as RegulatorSettings).map((f) => f.role)).toEqual(['R1', 'R2']);
    expect(regulatorKind.faults?.(stage({ from: 'VIN', vout: '5 V' }).settings as RegulatorSettings)).toEqual([]);
  });

  test('a positive regulator on a negative rail is refused with the rail named', () => {
    expect(() => run({ from: '-15V', parts: { R1: '240', R2: '720' } }, { '-15V': -15 })).toThrow(/positive regulator fed from rail "-15V"/);
    expect(() => run({ from: 'X', parts: { R1: '240', R2: '720' } }, { VIN: 12 })).toThrow(/rail "X".*rails: "VIN"/);
  });
});

describe('regulator plan', () => {
  test.each([
    [{ parts: { R1: '240', R2: '720' } }, /stages\[2\]\.from: missing/],
    [{ from: 'V', parts: { R1: '240' } }, /stages\[2\]\.parts\.R2: missing; write a resistance, e\.g\. "720 1%"/],
    [{ from: 'V', parts: { R1: '240', R2: '720' }, vref: '12 V' }, /stages\[2\]\.vref: "12 V" reads as 12 V, not a plausible value here/],
    [{ from: 'V', parts: { R1: '240', R2: '720' }, polarity: 'neg' }, /stages\[2\]\.polarity: "neg" is not one of "\+" or "-"/],
    [{ from: 'V', vout: '-5 V', polarity: '+' }, /stages\[2\]\.polarity: "\+" with a negative vout/],
    [{ from: 'V', vout: '5 V', vref: '1.25 V' }, /stages\[2\]\.vref: a fixed regulator/],
    [{ from: 'V', parts: { R1: '240', R2: '720', R3: '1k' } }, /stages\[2\]\.parts\.R3: is not a key here/],
  ])('%j', (json, message) => {
    expect(() => stage(json)).toThrow(StageParseError);
    expect(() => stage(json)).toThrow(message);
  });

  test('defaults: vref 1.25 V 4 %, iadj 50 µA, dropout 2 V', () => {
    const s = stage({ from: 'V', parts: { R1: '240', R2: '720' } });
    expect([s.parts['vref']?.nominal, s.parts['vref']?.tol, s.parts['iadj']?.nominal, s.parts['dropout']?.nominal]).toEqual([1.25, 0.04, 50e-6, 2]);
  });
});
