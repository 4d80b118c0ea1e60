import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { binOf, histogramBins } from '../../src/review/histogram.js';
import { trendOf } from '../../src/review/trend.js';

describe('histogram bins', () => {
  test('bin counts sum to n for any data and band (property, 300 runs)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { maxLength: 80 }),
        fc.integer({ min: 1, max: 40 }),
        fc.double({ min: -1e3, max: 1e3, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        (xs, bins, lo, w) => {
          const h = histogramBins(xs, { bins, band: { min: lo, max: lo + w }, nominal: lo + w / 2 });
          expect(h.counts).toHaveLength(bins);
          expect(h.counts.reduce((a, b) => a + b, 0)).toBe(xs.length);
          expect(h.lo).toBeLessThanOrEqual(Math.min(lo, ...xs));
          expect(h.hi).toBeGreaterThanOrEqual(Math.max(lo + w, ...xs));
        },
      ),
      { numRuns: 300 },
    );
  });

  test('hand-counted example: band 0 … 10 in 5 bins', () => {
    const h = histogramBins([0, 1.9, 2, 5, 9.99, 10], { bins: 5, band: { min: 0, max: 10 } });
    // [0,2) 0 and 1.9; [2,4) 2; [4,6) 5; [6,8) none; [8,10] 9.99 and 10 (last bin takes its edge)
    expect(h.counts).toEqual([2, 1, 1, 0, 2]);
    expect(binOf(h, 10)).toBe(4);
    expect(binOf(h, 0)).toBe(0);
  });

  test('the range spans the band even when the data do not', () => {
    const h = histogramBins([5, 5.1], { bins: 4, band: { min: 0, max: 8 } });
    // Hand-worked (exact): the band's edges 0 and 8 are wider than the data 5 … 5.1.
    expect([h.lo, h.hi]).toEqual([0, 8]);
  });

  test('one value alone still gets a bin; non-finite values are left out and counted', () => {
    const h = histogramBins([3, Number.NaN, Infinity], { bins: 3 });
    // Hand-counted (exact): 3 is the one finite value; NaN and ∞ are the two dropped.
    expect(h.counts.reduce((a, b) => a + b, 0)).toBe(1);
    expect(h.dropped).toBe(2);
    expect(h.hi).toBeGreaterThan(h.lo);
  });
});

describe('trend series', () => {
  const pt = (serial: string, value: number, at: string) => ({ serial, value, at, verdict: 'pass' as const, firstVerdict: 'pass' as const, revision: null });

  test('orders latest readings by time', () => {
    const t = trendOf([pt('B', 2, '2026-11-02T00:00:00Z'), pt('A', 1, '2026-11-01T00:00:00Z'), pt('C', 3, '2026-11-03T00:00:00Z')]);
    expect(t.values).toEqual([1, 2, 3]);
    expect(t.serials).toEqual(['A', 'B', 'C']);
    expect(t.first).toBe('2026-11-01T00:00:00Z');
  });

  test('thins a long series by averaging neighbours, keeping a drift visible', () => {
    const pts = Array.from({ length: 1000 }, (_, i) => pt(`S${i}`, i, new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString()));
    const t = trendOf(pts, 10);
    expect(t.values).toHaveLength(10);
    // Each of the 10 groups of 100 consecutive values 0..999 averages to 49.5 + 100k.
    for (const [k, v] of t.values.entries()) expect(v).toBeCloseTo(49.5 + 100 * k, 9);
  });
});
