import { describe, expect, test } from 'vitest';
import { formatPercent, formatValue } from '../../src/units/format.js';
import { parseValue } from '../../src/units/parse.js';

describe('engineering notation', () => {
  test.each([
    [4700, 'Ω', '4.7 kΩ'],
    [-11.95, 'V', '-11.95 V'],
    [1024, 'Hz', '1.024 kHz'],
    [22e-9, 'F', '22 nF'],
    [0.045, 'A', '45 mA'],
    [999.96, 'Hz', '1 kHz'],
    [0, 'V', '0 V'],
    [5e5, 'V/s', '0.5 V/µs'],
    [0.0231, '1', '2.31 %'],
  ] as const)('%d %s → %s', (v, unit, text) => {
    expect(formatValue(v, unit)).toBe(text);
  });

  test('formatted values parse back to the same value (4 significant digits)', () => {
    for (const v of [1.234e-12, 4.7e-9, 3.3e3, 1.5e6, 12, 0.5e-3]) {
      const r = parseValue(formatValue(v, 'F'), { expected: 'F' });
      expect(r.ok).toBe(true);
      // Four significant digits shown: a round trip within half a unit of the fourth digit, 5e-4.
      if (r.ok) expect(Math.abs(r.value - v) / v).toBeLessThan(5e-4);
    }
  });

  test('signed percentages', () => {
    expect(formatPercent(0.0234)).toBe('+2.34 %');
    expect(formatPercent(-0.1)).toBe('−10 %');
  });
});
