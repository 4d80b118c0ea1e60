import { describe, expect, test } from 'vitest';
import type { BatchCheck, BatchFigures } from '../../src/review/batch-types.js';
import { batchReducer, initialBatchState, selectedCheck, type BatchState } from '../../src/ui/batch/use-batch-state.js';

// Invented batch figures: three checks of an invented plan, their yields chosen
// so the weakest-first order is plain (lowest final yield first).
function check(id: string, finalYield: number | null, outliers = 0): BatchCheck {
  return {
    check: id,
    n: 4,
    pass: 4,
    marginal: 0,
    fail: 0,
    mean: null,
    sd: null,
    min: null,
    max: null,
    cp: null,
    cpk: null,
    plan: 'osc-demo',
    unit: 'V',
    nominal: null,
    band: null,
    bandRevision: null,
    bandsDiffer: false,
    firstPassYield: finalYield,
    finalYield,
    status: 'no-band',
    note: '',
    outliers: Array.from({ length: outliers }, (_, i) => ({
      serial: `PB-${i}`,
      check: id,
      value: 0,
      at: '2026-11-02T09:00:00.000Z',
      reasons: ['outside band' as const],
      z: null,
    })),
    points: [],
  };
}
function figures(checks: readonly BatchCheck[]): BatchFigures {
  return { boards: 4, firstPassBoards: 4, finalPassBoards: 4, firstPassYield: 1, finalYield: 1, incomplete: 0, checks, problems: [] };
}
const loaded: BatchState = batchReducer(initialBatchState, {
  type: 'figures',
  figures: figures([check('a.ok', 1), check('b.weak', 0.5, 2), check('c.mid', 0.75)]),
});

describe('batch reducer', () => {
  test('figures arrive weakest first, cursor on the weakest', () => {
    expect(loaded.status).toBe('ready');
    expect(loaded.rows.map((c) => c.check)).toEqual(['b.weak', 'c.mid', 'a.ok']);
    expect(selectedCheck(loaded)?.check).toBe('b.weak');
  });

  test('the cursor stays on its check when figures are rescanned', () => {
    const moved = batchReducer(loaded, { type: 'move', delta: 1 });
    expect(selectedCheck(moved)?.check).toBe('c.mid');
    const again = batchReducer(moved, { type: 'figures', figures: figures([check('c.mid', 0.25), check('a.ok', 1), check('b.weak', 0.5)]) });
    expect(again.rows.map((c) => c.check)).toEqual(['c.mid', 'b.weak', 'a.ok']);
    expect(selectedCheck(again)?.check).toBe('c.mid');
  });

  test('moves clamp at the ends and return the same state there', () => {
    expect(batchReducer(loaded, { type: 'move', delta: -1 })).toBe(loaded);
    expect(batchReducer(loaded, { type: 'move', delta: 99 }).selected).toBe(2);
  });

  test('tabs cycle the panels both ways; enter opens the outliers and back leaves them', () => {
    expect(batchReducer(loaded, { type: 'tab', delta: 1 }).panel).toBe('trend');
    expect(batchReducer(loaded, { type: 'tab', delta: -1 }).panel).toBe('outliers');
    const open = batchReducer(loaded, { type: 'open' });
    expect(open.panel).toBe('outliers');
    expect(batchReducer(open, { type: 'open' })).toBe(open);
    const down = batchReducer(open, { type: 'move', delta: 5 });
    expect(down.outlierSelected).toBe(1);
    expect(down.selected).toBe(0);
    expect(batchReducer(down, { type: 'back' }).panel).toBe('histogram');
  });

  test('help and the filter form hold the keys: no moves or tabs under them', () => {
    const help = batchReducer(loaded, { type: 'toggle-help' });
    expect(help.isHelpOpen).toBe(true);
    expect(batchReducer(help, { type: 'move', delta: 1 })).toBe(help);
    expect(batchReducer(help, { type: 'tab', delta: 1 })).toBe(help);
    expect(batchReducer(help, { type: 'form-open' })).toBe(help);
    expect(batchReducer(help, { type: 'back' }).isHelpOpen).toBe(false);
    const form = batchReducer(loaded, { type: 'form-open' });
    expect(form.form).not.toBeNull();
    expect(batchReducer(form, { type: 'move', delta: 1 })).toBe(form);
    expect(batchReducer(form, { type: 'toggle-help' })).toBe(form);
    expect(batchReducer(form, { type: 'back' }).form).toBeNull();
  });

  test('impossible moves return the same state', () => {
    expect(batchReducer(loaded, { type: 'form-apply' })).toBe(loaded);
    expect(batchReducer(loaded, { type: 'back' })).toBe(loaded);
    expect(batchReducer(initialBatchState, { type: 'open' })).toBe(initialBatchState);
  });
});
