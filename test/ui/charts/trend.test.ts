import { describe, expect, test } from 'vitest';
import { plot } from 'asciichart';
import { trendChart } from '../../../src/ui/charts/trend.js';

describe('trend chart', () => {
  test('is asciichart over the readings and the band edges, plus a legend', () => {
    const values = [9.0, 9.1, 9.2, 9.1];
    const text = trendChart(values, { height: 4, band: { min: 8.5, max: 9.5 }, unit: 'V', labelWidth: 8 });
    // Reference: asciichart itself with the same series and range (independent of our wrapper).
    const ref = plot([values, values.map(() => 9.5), values.map(() => 8.5)], {
      height: 4,
      min: 8.5,
      max: 9.5,
      format: (x: number) => `${Number(x.toPrecision(4))} V`.padStart(8),
    });
    const lines = text.split('\n');
    expect(lines.slice(0, -1).join('\n')).toBe(ref);
    expect(lines[lines.length - 1]).toBe(`${' '.repeat(10)}oldest → newest, 4 points; flat lines: band edges`);
  });

  test('fewer than two readings say so instead of drawing', () => {
    expect(trendChart([], {})).toBe('no readings to draw');
    expect(trendChart([1], {})).toBe('one reading: a trend needs at least two');
  });

  test('an open band side draws no line and does not stretch the axis to infinity', () => {
    const text = trendChart([0.01, 0.012, 0.011], { height: 3, band: { min: 0, max: Infinity }, unit: 'A' });
    expect(text).not.toContain('∞');
    // The floor at 0 A is the bottom label, printed as 0 (not a 1e-18 rounding residue).
    expect(text.split('\n')[3]).toMatch(/^ +0 A ┼/);
    expect(text).toContain('12 mA');
  });
});
