import { describe, expect, test } from 'vitest';
import { minMaxColumns, traceChart } from '../../../src/ui/charts/trace.js';

describe('minMaxColumns', () => {
  test('keeps a one-sample spike in its column', () => {
    const x = new Float64Array(10000);
    x[4321] = 5;
    x[8000] = -3;
    const e = minMaxColumns(x, 50);
    // 10000 / 50 = 200 samples per column: sample 4321 falls in column 21, 8000 in 40.
    expect(e.max[21]).toBe(5);
    expect(e.min[40]).toBe(-3);
    expect(Math.max(...e.max)).toBe(5);
    expect(e.max.filter((v) => v !== 0)).toHaveLength(1);
  });

  test('stretches a short series to the width, nearest sample per column', () => {
    const e = minMaxColumns(Float64Array.from([1, 2, 3]), 6);
    expect(Array.from(e.min)).toEqual([1, 1, 2, 2, 3, 3]);
    expect(Array.from(e.max)).toEqual([1, 1, 2, 2, 3, 3]);
  });
});

describe('traceChart', () => {
  test('exact small chart: a square drawn solid with axis labels and legend', () => {
    const square = Float64Array.from({ length: 8 }, (_, i) => (i < 4 ? 1 : -1));
    const chart = traceChart(null, square, { width: 18, height: 4 });
    // 18 columns less 10 for the labels: 8 columns, one per sample; the edge
    // column joins the high row to the low one.
    expect(chart).toBe(['     1 V ┼────', '     0 V ┤    │', '    -1 V ┼    │───', '          ─ captured'].join('\n'));
  });

  test('is exactly height lines and at most width columns', () => {
    const x = Float64Array.from({ length: 5000 }, (_, i) => Math.sin(i / 100));
    const lines = traceChart(x, x, { width: 60, height: 12, band: { min: -1.1, max: 1.1 } }).split('\n');
    expect(lines).toHaveLength(12);
    for (const l of lines) expect([...l].length).toBeLessThanOrEqual(60);
    expect(lines.at(-1)).toContain('─ captured');
    expect(lines.at(-1)).toContain('· expected');
    expect(lines.at(-1)).toContain('┄ band');
  });

  test('a spike in a long capture reaches the top row', () => {
    const x = new Float64Array(100000);
    x[55555] = 1;
    const lines = traceChart(null, x, { width: 50, height: 6, legend: false }).split('\n');
    expect(lines).toHaveLength(6);
    expect(lines[0]).toMatch(/│/);
  });

  test('the captured trace is drawn over the expected one', () => {
    const flat = new Float64Array(100).fill(0);
    const chart = traceChart(flat, flat, { width: 30, height: 4, legend: false });
    expect(chart).toContain('─');
    expect(chart).not.toContain('·');
  });

  test('nothing to draw says so', () => {
    expect(traceChart(null, null, { width: 40, height: 5 })).toBe('no trace to draw');
    expect(traceChart(null, Float64Array.from([Number.NaN]), { width: 40, height: 5 })).toBe('no finite values to draw');
  });
});
