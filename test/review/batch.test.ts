import { describe, expect, test } from 'vitest';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { batchFigures, weakestFirst } from '../../src/review/batch.js';
import { parseDateBound } from '../../src/review/filter.js';
import { board, demoBands, indexOf, revA, revB, summary } from './fixtures.js';

const d1 = '2026-11-02T09:00:00.000Z';
const d2 = '2026-11-03T09:00:00.000Z';
const d3 = '2026-11-04T09:00:00.000Z';

// Five invented boards of the invented plan, revision A (band 8 … 20 Hz on osc.freq).
function worked() {
  return indexOf(
    board('S001', { 'osc.freq': summary([16, 'pass', d1]), 'rails.p.dc': summary([12, 'pass', d1]) }),
    board('S002', { 'osc.freq': summary([14, 'pass', d1]), 'rails.p.dc': summary([12.1, 'pass', d1]) }),
    board('S003', { 'osc.freq': summary([25, 'fail', d1], [18, 'pass', d2], 2), 'rails.p.dc': summary([12, 'pass', d1]) }),
    board('S004', { 'osc.freq': summary([19.9, 'marginal', d2]), 'rails.p.dc': summary([12, 'pass', d2]) }),
    board('S005', { 'osc.freq': summary([22, 'fail', d3]), 'rails.p.dc': summary([11.5, 'fail', d3]) }),
  );
}

describe('batch figures from the index', () => {
  test('counts, yields and capability on a worked data set', () => {
    const f = batchFigures(worked(), demoBands());
    const freq = f.checks.find((c) => c.check === 'osc.freq');
    expect(freq).toBeDefined();
    if (!freq) return;
    // Latest readings: 16, 14, 18, 19.9, 22 — 3 pass, 1 marginal, 1 fail.
    expect([freq.n, freq.pass, freq.marginal, freq.fail]).toEqual([5, 3, 1, 1]);
    const xs = [16, 14, 18, 19.9, 22];
    // Mean and sample sd cross-checked against simple-statistics (abs 1e-12).
    expect(freq.mean).toBeCloseTo(mean(xs), 12);
    expect(freq.sd).toBeCloseTo(sampleStandardDeviation(xs), 12);
    expect([freq.min, freq.max]).toEqual([14, 22]);
    // NIST/SEMATECH §6.1.6 (from memory): Cp = (USL−LSL)/6s, Cpk = min(USL−x̄, x̄−LSL)/3s, band 8 … 20.
    const s = sampleStandardDeviation(xs);
    const m = mean(xs);
    expect(freq.cp).toBeCloseTo(12 / (6 * s), 12);
    expect(freq.cpk).toBeCloseTo(Math.min(20 - m, m - 8) / (3 * s), 12);
    // First-pass: first readings pass, pass, fail, marginal, fail → 2 of 5; final 3 of 5.
    expect(freq.firstPassYield).toBeCloseTo(2 / 5, 12);
    expect(freq.finalYield).toBeCloseTo(3 / 5, 12);
    expect(freq.unit).toBe('Hz');
    expect(freq.band).toEqual({ min: 8, max: 20 });
    // Whole boards: S001 and S002 passed every check first time; S003 passes now too.
    expect([f.boards, f.firstPassBoards, f.finalPassBoards]).toEqual([5, 2, 3]);
    expect(f.firstPassYield).toBeCloseTo(0.4, 12);
    expect(f.finalYield).toBeCloseTo(0.6, 12);
  });

  test('checks come in plan order; the weakest-first sort puts the lowest final yield first', () => {
    const f = batchFigures(worked(), demoBands());
    expect(f.checks.map((c) => c.check)).toEqual(['osc.freq', 'rails.p.dc']);
    expect([...f.checks].sort(weakestFirst).map((c) => c.check)).toEqual(['osc.freq', 'rails.p.dc']);
  });

  test('outliers: a board outside its band is listed with the reason', () => {
    const freq = batchFigures(worked(), demoBands()).checks.find((c) => c.check === 'osc.freq');
    expect(freq?.outliers.map((o) => [o.serial, o.reasons])).toEqual([['S005', ['outside band']]]);
  });

  test('outliers: a reading inside the band but beyond 3σ of the batch is listed', () => {
    const boards = Array.from({ length: 30 }, (_, i) => board(`T${String(i).padStart(3, '0')}`, { 'osc.freq': summary([16 + (i % 3) * 0.01, 'pass', d1]) }));
    boards.push(board('T999', { 'osc.freq': summary([19, 'pass', d2]) }));
    const freq = batchFigures(indexOf(...boards), demoBands()).checks[0];
    expect(freq?.outliers.map((o) => [o.serial, o.reasons])).toEqual([['T999', ['beyond 3σ']]]);
    // An outlier lies beyond 3σ of the batch mean (the review's rule, common practice, no source).
    expect(Math.abs(freq?.outliers[0]?.z ?? 0)).toBeGreaterThan(3);
  });

  test('one board gives "not enough data" and null indices, never NaN', () => {
    const f = batchFigures(indexOf(board('S001', { 'osc.freq': summary([16, 'pass', d1]) })), demoBands());
    const c = f.checks[0];
    expect(c).toMatchObject({ n: 1, sd: null, cp: null, cpk: null, status: 'not-enough-data' });
    expect(JSON.stringify(f.checks.map((x) => [x.cp, x.cpk, x.sd]))).toBe('[[null,null,null]]');
  });

  test('filters: plan, revision prefix, check and date range on the latest reading', () => {
    const index = indexOf(
      ...Object.values(worked().boards),
      board('X001', { 'osc.freq': summary([17, 'pass', d2]) }, revB),
      board('Y001', { 'osc.freq': summary([5, 'fail', d2]) }, revA, 'other-plan'),
    );
    const bands = demoBands();
    expect(
      batchFigures(index, bands)
        .checks.filter((c) => c.check === 'osc.freq')
        .map((c) => c.plan),
    ).toEqual(['osc-demo', 'other-plan']);
    expect(batchFigures(index, bands, { plan: 'osc-demo' }).boards).toBe(6);
    expect(batchFigures(index, bands, { plan: 'osc-demo', revision: 'bbbb' }).boards).toBe(1);
    expect(batchFigures(index, bands, { plan: 'osc-demo', check: 'rails.p.dc' }).checks.map((c) => c.check)).toEqual(['rails.p.dc']);
    const from = parseDateBound('2026-11-03', 'from') ?? NaN;
    const to = parseDateBound('2026-11-03', 'to') ?? NaN;
    const day2 = batchFigures(index, bands, { plan: 'osc-demo', from, to });
    // Latest readings on 3 Nov: S003 and S004 (both checks of S004, osc.freq of S003) and X001.
    expect(day2.checks.find((c) => c.check === 'osc.freq')?.n).toBe(3);
    expect(day2.checks.find((c) => c.check === 'rails.p.dc')?.n).toBe(1);
  });

  test('revisions: the newest revision measured sets the band, and a differing older band is flagged', () => {
    const index = indexOf(...Object.values(worked().boards), board('X001', { 'osc.freq': summary([17, 'pass', '2026-11-09T00:00:00Z']) }, revB));
    const freq = batchFigures(index, demoBands()).checks.find((c) => c.check === 'osc.freq');
    expect(freq?.band).toEqual({ min: 7, max: 21 });
    expect(freq?.bandRevision).toBe(revB);
    expect(freq?.bandsDiffer).toBe(true);
    // S005 at 22 is outside both bands; S004 at 19.9 is inside both.
    expect(freq?.outliers.map((o) => o.serial)).toEqual(['S005']);
  });

  test('a missing snapshot leaves the band unknown with its own status, counts still made', () => {
    const f = batchFigures(worked(), new Map());
    const freq = f.checks.find((c) => c.check === 'osc.freq');
    expect(freq).toMatchObject({ n: 5, pass: 3, band: null, cp: null, cpk: null, status: 'no-band', unit: null });
  });

  test('dates: a bare day covers the whole UTC day; nonsense is refused', () => {
    expect(parseDateBound('2026-11-03', 'from')).toBe(Date.UTC(2026, 10, 3));
    expect(parseDateBound('2026-11-03', 'to')).toBe(Date.UTC(2026, 10, 4) - 1);
    expect(parseDateBound('2026-11-03T12:00:00Z', 'to')).toBe(Date.UTC(2026, 10, 3, 12));
    expect(parseDateBound('2026-02-30', 'from')).toBeNull();
    expect(parseDateBound('yesterday', 'from')).toBeNull();
  });
});

describe('batch figures through the per-check columns', () => {
  test('the same figures, outliers and points as through the board objects, times written in any form', async () => {
    const { decodeCheckColumns, encodeCheckColumns } = await import('../../src/log/check-columns.js');
    const { batchJson } = await import('../../src/review/batch-json.js');
    // The worked data set plus a board on revision B and one whose time lacks milliseconds.
    const objects = indexOf(
      ...Object.values(worked().boards),
      board('S006', { 'osc.freq': summary([40, 'fail', '2026-11-05T09:00:00Z']), 'rails.p.dc': summary([12, 'pass', d3]) }, revB),
      board('S007', { 'osc.freq': summary([15, 'pass', '2026-11-04T09:00:00.000+00:00']) }),
    );
    const columns = decodeCheckColumns(encodeCheckColumns(Object.values(objects.boards).map((b) => [b.serial, b.checks] as [string, typeof b.checks])));
    expect(columns).not.toBeNull();
    const withColumns = Object.defineProperty({ ...objects }, 'checkColumns', { value: columns, enumerable: false });
    for (const filter of [{}, { check: 'osc.freq' }, { from: Date.parse(d2) }, { revision: revB.slice(0, 6) }]) {
      const a = batchFigures(objects, demoBands(), filter);
      const b = batchFigures(withColumns, demoBands(), filter);
      expect(JSON.stringify(batchJson(b, 'x'))).toBe(JSON.stringify(batchJson(a, 'x')));
      expect(b.checks.map((c) => c.points)).toEqual(a.checks.map((c) => c.points));
      expect([b.boards, b.incomplete, b.firstPassBoards, b.finalPassBoards]).toEqual([a.boards, a.incomplete, a.firstPassBoards, a.finalPassBoards]);
    }
  });
});
