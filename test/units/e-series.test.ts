import { describe, expect, test } from 'vitest';
import { isStandard, nearestStandard, seriesValues } from '../../src/units/e-series.js';

describe('IEC 60063:2015 preferred numbers', () => {
  // IEC 60063:2015, E24 series, typed here from memory (not from the document at hand).
  const e24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1];

  test('E24 as listed in the standard', () => {
    expect(seriesValues('E24')).toEqual(e24);
  });

  test('E12, E6 and E3 are every 2nd, 4th and 8th E24 value', () => {
    // IEC 60063: each lower series is a subset of the next (from memory).
    expect(seriesValues('E12')).toEqual(e24.filter((_, i) => i % 2 === 0));
    expect(seriesValues('E6')).toEqual([1.0, 1.5, 2.2, 3.3, 4.7, 6.8]);
    expect(seriesValues('E3')).toEqual([1.0, 2.2, 4.7]);
  });

  test('E48/E96/E192 follow 10^(i/N) rounded to three figures, E192 with 9.20 for 9.19', () => {
    // The construction rule of the E48+ series (IEC 60063; from memory), computed here independently.
    for (const n of [48, 96, 192] as const) {
      const expected = Array.from({ length: n }, (_, i) => Math.round(10 ** (i / n) * 100) / 100).map((v) =>
        n === 192 && Math.abs(v - 9.19) < 1e-9 ? 9.2 : v,
      );
      expect(seriesValues(`E${n}`)).toEqual(expected);
    }
    // Spot values widely printed on resistor charts (from memory): 4.99 and 1.65 in E96, 4.87 in E192.
    expect(seriesValues('E96')).toContain(4.99);
    expect(seriesValues('E96')).toContain(1.65);
    expect(seriesValues('E192')).toContain(4.87);
  });

  test('nearest standard value and neighbours across a decade edge', () => {
    const a = nearestStandard(4650, 'E24');
    expect(a.nearest).toBe(4700);
    expect(a.below).toBe(4300);
    expect(a.above).toBe(5100);
    const b = nearestStandard(9.7e3, 'E12');
    expect(b.nearest).toBe(10e3);
    expect(b.below).toBe(8.2e3);
    expect(b.above).toBe(12e3);
    expect(isStandard(2.2e-8, 'E6')).toBe(true);
    expect(isStandard(2.3e-8, 'E24')).toBe(false);
  });
});
