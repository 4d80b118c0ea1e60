import { describe, expect, test } from 'vitest';
import { manualKind } from '../../src/circuit/manual.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';

const parse = (json: Record<string, unknown>) => manualKind.parse({ json, path: 'stages[5]' }, 'x.plan.json');

function valueAt(json: Record<string, unknown>, role: string, x: number): Record<string, number> {
  const p = parse(json);
  const parts = Object.fromEntries(Object.entries(p.parts).map(([k, v]) => [k, k === role ? x : v.nominal]));
  return manualKind.evaluate({ parts, settings: p.settings, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {} }).values as Record<string, number>;
}

const plan = {
  checks: [
    { id: 'ref.dc', quantity: 'reference voltage', unit: 'V', nominal: '2.5 V', tol: '2%' },
    { id: 'offset', quantity: 'output offset', unit: 'V', min: '-5 mV', max: '5 mV', instrument: 'meter', how: 'DC voltmeter at TP9, input shorted' },
    { id: 'bias', quantity: 'bias current', unit: 'A', nominal: '2 mA', tol: '0.1 mA' },
    { id: 'duty', quantity: 'relay duty', unit: '%', nominal: '50%', tol: '2%' },
  ],
};

describe('manual targets', () => {
  test('checks reflect the plan', () => {
    const p = parse(plan);
    expect(manualKind.checks(p.settings)).toEqual([
      expect.objectContaining({ key: 'ref.dc', quantity: 'reference voltage', unit: 'V', instrument: 'meter' }),
      expect.objectContaining({ key: 'offset', unit: 'V', how: 'DC voltmeter at TP9, input shorted' }),
      expect.objectContaining({ key: 'bias', unit: 'A' }),
      expect.objectContaining({ key: 'duty', unit: '1' }),
    ]);
  });

  test('values are the nominals; a percentage tolerance is a toleranced part', () => {
    const p = parse(plan);
    expect(p.parts['checks[0].nominal']).toMatchObject({ nominal: 2.5, tol: 0.02, unit: 'V' });
    const v = valueAt(plan, '', 0);
    expect(v).toEqual({ 'ref.dc': 2.5, offset: 0, bias: 0.002, duty: 0.5 });
  });

  test('min/max (and an absolute tolerance) map the tolerance box of the band part exactly onto the band', () => {
    const p = parse(plan);
    // Position part: nominal 1, tolerance 50 %: its box 0.5 … 1.5 is the band's min … max.
    expect(p.parts['checks[1].band']).toMatchObject({ nominal: 1, tol: 0.5, unit: '1' });
    // Expected ends are the plan's own limits (offset −5 … 5 mV, bias 2 mA ± 0.1 mA), no computation.
    expect(valueAt(plan, 'checks[1].band', 0.5)['offset']).toBeCloseTo(-0.005, 15);
    expect(valueAt(plan, 'checks[1].band', 1.5)['offset']).toBeCloseTo(0.005, 15);
    expect(valueAt(plan, 'checks[2].band', 0.5)['bias']).toBeCloseTo(0.0019, 15);
    expect(valueAt(plan, 'checks[2].band', 1.5)['bias']).toBeCloseTo(0.0021, 15);
    // A fraction's percentage tolerance is in percentage points: 50 % ± 2 points.
    expect(valueAt(plan, 'checks[3].band', 1.5)['duty']).toBeCloseTo(0.52, 15);
  });

  test.each([
    [{}, /stages\[5\]\.checks: missing/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'V' }] }, /stages\[5\]\.checks\[0\]: no target/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'V', nominal: '1 V', min: '0 V', max: '2 V' }] }, /not both/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'mV', nominal: '1 V', tol: '1%' }] }, /stages\[5\]\.checks\[0\]\.unit: "mV" is not a unit/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'V', min: '2 V', max: '1 V' }] }, /stages\[5\]\.checks\[0\]\.max: "1 V" must be above min "2 V"/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'V', nominal: '0 V', tol: '5%' }] }, /stages\[5\]\.checks\[0\]\.tol: a percentage of a zero nominal/],
    [
      {
        checks: [
          { id: 'a', quantity: 'q', unit: 'V', nominal: '1 V', tol: '5%' },
          { id: 'a', quantity: 'q', unit: 'V', nominal: '1 V', tol: '5%' },
        ],
      },
      /stages\[5\]\.checks\[1\]\.id: "a" is used twice/,
    ],
    [{ checks: [{ id: 'a b', quantity: 'q', unit: 'V', nominal: '1 V', tol: '5%' }] }, /stages\[5\]\.checks\[0\]\.id: "a b" is not a check key/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'V', nominal: '1 V', tol: '5%', instrument: 'probe' }] }, /stages\[5\]\.checks\[0\]\.instrument: "probe"/],
    [{ checks: [{ id: 'a', quantity: 'q', unit: 'V', nominal: '1 A', tol: '5%' }] }, /stages\[5\]\.checks\[0\]\.nominal: .*current/],
  ])('plan error %j', (json, message) => {
    expect(() => parse(json)).toThrow(StageParseError);
    expect(() => parse(json)).toThrow(message);
  });
});
