import { describe, expect, test } from 'vitest';
import { defaultBins, histogramChart } from '../../../src/ui/charts/histogram.js';

describe('histogram chart', () => {
  test('draws bars per bin, marks band edges and nominal at their columns, and a legend in words', () => {
    // 10 bins over 0 … 10 with 6 plot columns per bin: 66 columns wide less the 6-column gutter.
    const text = histogramChart([1, 1.5, 5, 5.2, 5.4, 9], { width: 66, height: 3, band: { min: 0, max: 10 }, nominal: 5, bins: 10 });
    const lines = text.split('\n');
    expect(lines).toHaveLength(3 + 4);
    // Top row: only the bin [5, 6) reaches 3 boards; the count scale is printed beside it.
    expect(lines[0]).toBe(`   3 │${' '.repeat(30)}█████ ${' '.repeat(24)}`);
    // Bottom row: bins [1,2) (2 boards), [5,6) (3) and [9,10] (1) all show.
    expect(lines[2]).toBe(`     │      █████ ${' '.repeat(18)}█████ ${' '.repeat(18)}█████ `);
    expect(lines[3]).toBe(`   0 └${'─'.repeat(60)}`);
    // Band edges at columns 0 and 59, nominal at column 30 (5 of 10 across 60 columns).
    expect(lines[4]).toBe(`      [${' '.repeat(29)}N${' '.repeat(28)}]`);
    expect(lines[6]).toBe('      6 boards in 10 bins   [ ] band 0 … 10   N nominal 5');
  });

  test('formats the axis in the check unit with SI prefixes', () => {
    const text = histogramChart([3500, 3520, 3540], { width: 80, height: 2, band: { min: 3256, max: 3809 }, nominal: 3518, unit: 'Hz' });
    expect(text).toContain('3.256 kHz');
    expect(text).toContain('3.809 kHz');
    expect(text).toContain('N nominal 3.518 kHz');
  });

  test('never wider than asked: a narrow chart drops legend parts instead of wrapping', () => {
    const text = histogramChart([3500, 3520, 3540], { width: 40, height: 2, band: { min: 3256, max: 3809 }, nominal: 3518, unit: 'Hz' });
    for (const line of text.split('\n')) expect([...line].length).toBeLessThanOrEqual(40);
    expect(text).toContain('3 boards in 5 bins');
  });

  test('an open band side (±∞) gets no mark; no readings says so', () => {
    const text = histogramChart([1e5, 2e5], { width: 30, height: 2, band: { min: 100, max: Infinity }, unit: 'Ω' });
    expect(text.split('\n')[3]).toMatch(/^ {6}\[ *$/);
    expect(histogramChart([], {})).toBe('no readings to draw');
  });

  test('about 2·√n bins, at least 5, never more than the columns', () => {
    // The 2·√n rule is common practice, no source; the figures are hand-worked:
    // ⌈2·√6⌉ = ⌈4.9⌉ = 5; 2·√100 = 20; 2·√10000 = 200, held to the 70 columns.
    expect(defaultBins(6, 70)).toBe(5);
    expect(defaultBins(100, 70)).toBe(20);
    expect(defaultBins(10_000, 70)).toBe(70);
  });
});
