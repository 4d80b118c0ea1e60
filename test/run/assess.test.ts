import { describe, expect, test } from 'vitest';
import { assessReading } from '../../src/run/assess.js';
import { targets } from './fixture.js';

const plan = {
  uncertainty: { V: { relative: 0.005, absolute: 0.002 }, Hz: { relative: 0.0001, absolute: 0 } },
  checkUncertainty: {},
};
const byCheck = (check: string) => {
  const t = targets.find((x) => x.check === check);
  if (!t) throw new Error(check);
  return t;
};

describe('assessReading', () => {
  test('takes values as technicians type them', () => {
    // The same 2.498 kHz written four ways (SI prefix, RKM code per IEC 60062, unit, spaces).
    for (const text of ['2.498k', '2k498', '2.498 kHz', ' 2498Hz ']) {
      const a = assessReading(plan, byCheck('osc.freq'), text);
      expect(a.ok && a.value).toBeCloseTo(2498, 9);
    }
    const neg = assessReading(plan, byCheck('rails.-12V.dc'), '-11.9');
    expect(neg.ok && neg.value).toBe(-11.9);
    const withUnit = assessReading(plan, byCheck('rails.+12V.dc'), '12.1V');
    expect(withUnit.ok && withUnit.result.verdict).toBe('pass');
  });

  test('rejects a wrong unit or garbage with the parser message', () => {
    const wrong = assessReading(plan, byCheck('osc.freq'), '12 V');
    expect(wrong.ok).toBe(false);
    expect(!wrong.ok && wrong.message).toMatch(/expected a frequency/);
    const garbage = assessReading(plan, byCheck('osc.freq'), 'abc');
    expect(!garbage.ok && garbage.message).toMatch(/not a number/);
    const tol = assessReading(plan, byCheck('osc.freq'), '2.5k 1%');
    expect(tol.ok).toBe(false);
  });

  test('verdicts with the guard band (ILAC-G8 simple acceptance, U = 0.5 % + 2 mV)', () => {
    // Band 11.64 … 12.36 V. At 12.30 V, U = 0.0635 V: 12.3635 > 12.36, straddles → marginal.
    const edge = assessReading(plan, byCheck('rails.+12V.dc'), '12.30');
    expect(edge.ok && edge.result.verdict).toBe('marginal');
    // At 12.29 V, U = 0.06345 V: 12.35345 inside → pass.
    const pass = assessReading(plan, byCheck('rails.+12V.dc'), '12.29');
    expect(pass.ok && pass.result.verdict).toBe('pass');
    // At 12.5 V, 12.5 − 0.0645 = 12.4355 > 12.36 → fail.
    const fail = assessReading(plan, byCheck('rails.+12V.dc'), '12.5');
    expect(fail.ok && fail.result.verdict).toBe('fail');
    // Deviation as a fraction of nominal, hand-worked: (12.5 − 12) / 12 (common practice, no source).
    expect(fail.ok && fail.result.deviation).toBeCloseTo(0.5 / 12, 12);
  });

  test('an open circuit on a resistance check reads as infinity and passes a no-short band', () => {
    for (const text of ['OL', 'open', 'o.l.']) {
      const a = assessReading(plan, byCheck('rails.+12V.to-ground'), text);
      expect(a.ok && a.value).toBe(Infinity);
      expect(a.ok && a.result.verdict).toBe('pass');
    }
    expect(assessReading(plan, byCheck('rails.+12V.dc'), 'OL').ok).toBe(false);
  });
});
