import type { BoardFile, CaptureRef, Reading, Rework, Run } from '../analysis/records.js';
import type { CheckBand, SnapshotBands } from './bands.js';

export type TimelineEntry =
  | { readonly kind: 'run'; readonly at: string; readonly run: Run }
  | {
      readonly kind: 'reading';
      readonly at: string;
      readonly reading: Reading;
      /** The target as it was when measured (from the reading's plan snapshot), or null. */
      readonly target: CheckBand | null;
      /** (value − nominal) / |nominal|, or null without a target, with a zero nominal or for a limit check. */
      readonly deviation: number | null;
    }
  | { readonly kind: 'rework'; readonly at: string; readonly rework: Rework }
  | { readonly kind: 'capture'; readonly at: string; readonly capture: CaptureRef };

const kindOrder: Readonly<Record<TimelineEntry['kind'], number>> = { run: 0, rework: 1, capture: 2, reading: 3 };

/** Plan hashes a board's readings and runs refer to (to load their snapshots). */
export function boardHashes(board: BoardFile): string[] {
  return [...new Set([...board.runs.map((r) => r.planHash), ...board.readings.map((r) => r.planHash)])];
}

/** One board's runs, readings, rework notes and captures in time order. */
export function timelineOf(board: BoardFile, bands: ReadonlyMap<string, SnapshotBands>): TimelineEntry[] {
  const entries: TimelineEntry[] = [];
  for (const run of board.runs) entries.push({ kind: 'run', at: run.started, run });
  for (const rework of board.rework) entries.push({ kind: 'rework', at: rework.at, rework });
  for (const capture of board.captures) entries.push({ kind: 'capture', at: capture.at, capture });
  for (const reading of board.readings) {
    const target = bands.get(reading.planHash)?.bands.get(reading.check) ?? null;
    const deviation =
      target && target.nominal !== 0 && !target.isLimit && Number.isFinite(reading.value) ? (reading.value - target.nominal) / Math.abs(target.nominal) : null;
    entries.push({ kind: 'reading', at: reading.at, reading, target, deviation });
  }
  // Stable: entries at the same instant keep run → rework → capture → reading order.
  return entries
    .map((e, i) => ({ e, i, t: Date.parse(e.at) }))
    .sort((a, b) => a.t - b.t || kindOrder[a.e.kind] - kindOrder[b.e.kind] || a.i - b.i)
    .map((x) => x.e);
}

/** One check on either side of a rework. */
export interface ReworkRow {
  readonly check: string;
  /** The last reading before the rework, or null. */
  readonly before: Reading | null;
  /** The first reading after it, or null. */
  readonly after: Reading | null;
}

/**
 * A check's readings before and after a rework, side by side: the last reading
 * before and the first after, for every check read on either side. Checks of
 * the reworked part's own stage come first, since that is where the change
 * should show.
 */
export function reworkComparison(board: BoardFile, rework: Rework): ReworkRow[] {
  const t = Date.parse(rework.at);
  const rows = new Map<string, { before: Reading | null; after: Reading | null }>();
  const byTime = [...board.readings].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
  for (const r of byTime) {
    const row = rows.get(r.check) ?? { before: null, after: null };
    const at = Date.parse(r.at);
    if (at < t) row.before = r;
    else if (row.after === null) row.after = r;
    rows.set(r.check, row);
  }
  const stage = rework.part.split('.')[0] ?? '';
  const own = (check: string) => (check.startsWith(`${stage}.`) ? 0 : 1);
  return [...rows]
    .map(([check, row]) => ({ check, ...row }))
    .sort((a, b) => own(a.check) - own(b.check) || (a.check < b.check ? -1 : a.check > b.check ? 1 : 0));
}

/** Counts for a history header. */
export function historyCounts(board: BoardFile): { runs: number; readings: number; pass: number; marginal: number; fail: number; rework: number } {
  let pass = 0;
  let marginal = 0;
  let fail = 0;
  for (const r of board.readings) {
    if (r.verdict === 'pass') pass++;
    else if (r.verdict === 'marginal') marginal++;
    else fail++;
  }
  return { runs: board.runs.length, readings: board.readings.length, pass, marginal, fail, rework: board.rework.length };
}
