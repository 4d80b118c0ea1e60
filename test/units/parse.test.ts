import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { parseValue } from '../../src/units/parse.js';
import type { Unit } from '../../src/units/unit.js';

function value(text: string, expected?: Unit): number {
  const r = parseValue(text, expected ? { expected } : {});
  if (!r.ok) throw new Error(r.message);
  return r.value;
}

describe('RKM codes', () => {
  // IEC 60062:2016 RKM code: the letter marks the decimal point and the multiplier
  // (R = 1, k = 10^3, M = 10^6, p/n/u for capacitors). Examples typed from memory.
  test.each([
    ['4k7', 4700],
    ['2R2', 2.2],
    ['R47', Number.NaN], // a leading R is not accepted by us: write 0R47
    ['0R47', 0.47],
    ['1M5', 1.5e6],
    ['47R', 47],
    ['10n', 10e-9],
    ['4n7', 4.7e-9],
    ['2u2', 2.2e-6],
    ['6p8', 6.8e-12],
  ])('%s', (text, expected) => {
    const r = parseValue(text, { expected: text.includes('n') || text.includes('u') || text.includes('p') ? 'F' : 'Ω' });
    if (Number.isNaN(expected)) {
      expect(r.ok).toBe(false);
      return;
    }
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(expected, 15); // exact to 1e-15 absolute, relative much tighter for big values
    if (r.ok) expect(Math.abs(r.value - expected) / expected).toBeLessThan(1e-12);
  });

  test('R alone marks a resistance', () => {
    const r = parseValue('2R2');
    expect(r.ok && r.unit).toBe('Ω');
  });
});

describe('SI prefixes', () => {
  // BIPM, The International System of Units, 9th ed. (2019), Table 7: prefix factors.
  test.each([
    ['1 fF', 1e-15, 'F'],
    ['1 pF', 1e-12, 'F'],
    ['1 nF', 1e-9, 'F'],
    ['1 uF', 1e-6, 'F'],
    ['1 µF', 1e-6, 'F'],
    ['1 mA', 1e-3, 'A'],
    ['1 kHz', 1e3, 'Hz'],
    ['1 MHz', 1e6, 'Hz'],
    ['1 GHz', 1e9, 'Hz'],
    ['1meg', 1e6, 'Ω'],
  ] as const)('%s', (text, factor, unit) => {
    const r = parseValue(text, { expected: unit });
    expect(r.ok).toBe(true);
    // SI prefix factors (BIPM SI Brochure, 9th ed., Table 7).
    if (r.ok) expect(Math.abs(r.value - factor) / factor).toBeLessThan(1e-12);
  });
});

describe('values as a technician types them', () => {
  test.each([
    ['4.98k', 'Ω', 4980],
    ['4k98', 'Ω', 4980],
    ['4.98 kHz', 'Hz', 4980],
    ['-11.9', 'V', -11.9],
    ['12.1V', 'V', 12.1],
    ['12.1 v', 'V', 12.1],
    ['4,98', 'V', 4.98],
    ['45 mA', 'A', 0.045],
    ['0.5 V/us', 'V/s', 5e5],
    ['0.5 V/µs', 'V/s', 5e5],
    ['100 ohm', 'Ω', 100],
    ['10 ms', 's', 0.01],
    ['−3.3', 'V/V', -3.3],
  ] as const)('%s as %s', (text, unit, expected) => {
    // RKM codes per IEC 60062:2016 (the letter marks the decimal point and the multiplier).
    expect(value(text, unit)).toBeCloseTo(expected, 9);
  });

  test('a bare number takes the expected unit', () => {
    const r = parseValue('12', { expected: 'V' });
    expect(r.ok && r.unit).toBe('V');
  });

  test('percent is a fraction where a plain number is expected', () => {
    // Per cent is 1/100 (BIPM SI Brochure, 9th ed.).
    expect(value('2.5%', '1')).toBeCloseTo(0.025, 12);
  });
});

describe('tolerances in plans', () => {
  test.each([
    ['22n 5%', 'F', 22e-9, 0.05],
    ['4k7 1%', 'Ω', 4700, 0.01],
    ['10k ±20%', 'Ω', 10e3, 0.2],
  ] as const)('%s', (text, unit, v, tol) => {
    const r = parseValue(text, { expected: unit });
    expect(r.ok).toBe(true);
    if (r.ok) {
      // The value formatted by the property's generator, read back (round trip, no outside figure).
      expect(r.value).toBeCloseTo(v, 15);
      expect(r.tol).toBeCloseTo(tol, 12);
    }
  });

  test('a reading may not carry a tolerance', () => {
    const r = parseValue('4k7 1%', { expected: 'Ω', allowTolerance: false });
    expect(r.ok).toBe(false);
  });
});

describe('wrong dimensions and garbage', () => {
  test('a voltage where a capacitance is expected names both', () => {
    const r = parseValue('3.9 V', { expected: 'F' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/is a voltage; expected a capacitance/);
  });

  test.each(['', 'abc', '5 x', '1..2', 'k', '--3', '4k7k'])('%j is refused with a message', (text) => {
    const r = parseValue(text, { expected: 'Ω' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message.length).toBeGreaterThan(5);
  });

  test('never throws, and every refusal has a message (property)', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 20 }), fc.constantFrom<Unit | undefined>('V', 'Ω', 'F', 'Hz', '1', undefined), (text, unit) => {
        const r = parseValue(text, unit ? { expected: unit } : {});
        if (r.ok) return Number.isFinite(r.value) && (unit === undefined || r.unit === unit);
        return typeof r.message === 'string' && r.message.length > 0;
      }),
      { numRuns: 2000 },
    );
  });

  test('round trip of engineering numbers (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-12, max: 1e9, noNaN: true }), (v) => {
        const r = parseValue(`${v.toPrecision(6)}`, { expected: 'V' });
        return r.ok && Math.abs(r.value - Number(v.toPrecision(6))) <= Math.abs(v) * 1e-9;
      }),
      { numRuns: 500 },
    );
  });
});
