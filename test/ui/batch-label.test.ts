import { describe, expect, test } from 'vitest';
import type { BatchCheck } from '../../src/review/batch-types.js';
import { checkLabeller } from '../../src/ui/batch/batch-table.js';

// Only the fields the label reads; the rest of a BatchCheck does not matter here.
const row = (plan: string | null, check: string) => ({ plan, check }) as BatchCheck;

describe('batch table row names', () => {
  test('one plan: the check id alone', () => {
    const rows = [row('exciter-demo', 'osc.freq'), row('exciter-demo', 'drive.out.vpp')];
    expect(rows.map(checkLabeller(rows))).toEqual(['osc.freq', 'drive.out.vpp']);
  });

  test('two plans with the same check id: each row names its plan, so the two are told apart', () => {
    const rows = [row('exciter-demo', 'osc.freq'), row('line-driver-demo', 'osc.freq')];
    const labels = rows.map(checkLabeller(rows));
    expect(labels).toEqual(['exciter-demo osc.freq', 'line-driver-demo osc.freq']);
    expect(new Set(labels).size).toBe(2);
  });
});
