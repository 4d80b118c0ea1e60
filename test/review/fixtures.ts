// Invented test data for the review tests: a made-up "osc-demo" plan with two
// checks; no real board or published design.
import type { Target, Verdict } from '../../src/analysis/types.js';
import type { BoardSummary, CheckSummary, LogIndex } from '../../src/log/types.js';
import { toSnapshotBands, type SnapshotBands } from '../../src/review/bands.js';

export const revA = 'a'.repeat(64);
export const revB = 'b'.repeat(64);

export function target(check: string, nominal: number, min: number, max: number, unit: Target['unit'] = 'Hz'): Target {
  return {
    check,
    stage: check.split('.')[0] ?? '',
    quantity: check.split('.').slice(1).join('.'),
    unit,
    nominal,
    worst: { min, max },
    stat: { min: min + (max - min) * 0.1, max: max - (max - min) * 0.1 },
    testPoint: 'TP1',
    contributors: [],
    instrument: 'counter',
    how: 'counter on TP1',
    phase: 'stage',
  };
}

/** Bands of two revisions of the invented plan: revision B widened the frequency band. */
export function demoBands(): Map<string, SnapshotBands> {
  return new Map([
    [revA, toSnapshotBands(revA, { plan: 'osc-demo', targets: [target('osc.freq', 16, 8, 20), target('rails.p.dc', 12, 11.6, 12.4, 'V')] })],
    [revB, toSnapshotBands(revB, { plan: 'osc-demo', targets: [target('osc.freq', 16, 7, 21), target('rails.p.dc', 12, 11.6, 12.4, 'V')] })],
  ]);
}

export function summary(first: [number, Verdict, string], latest: [number, Verdict, string] = first, count = 1): CheckSummary {
  return { first: { value: first[0], verdict: first[1], at: first[2] }, latest: { value: latest[0], verdict: latest[1], at: latest[2] }, count };
}

export function board(serial: string, checks: Record<string, CheckSummary>, planHash = revA, plan = 'osc-demo'): BoardSummary {
  const times = Object.values(checks)
    .map((c) => c.latest.at)
    .sort();
  return {
    serial,
    plan,
    planHash,
    state: 'passed',
    lastRunAt: times[times.length - 1] ?? null,
    runs: 1,
    readings: Object.values(checks).reduce((a, c) => a + c.count, 0),
    rework: 0,
    checks,
  };
}

export function indexOf(...boards: BoardSummary[]): LogIndex {
  return { schemaVersion: 1, boards: Object.fromEntries(boards.map((b) => [b.serial, b])) };
}
