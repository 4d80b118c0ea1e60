import type { BoardSummary, CheckSummary } from './types.js';

/** A board's line in the index without its per-check summaries (kept apart, loaded on demand). */
export type BoardHead = Omit<BoardSummary, 'checks'>;
export type CheckMap = Record<string, CheckSummary>;

/**
 * One line of `index.journal`, appended after a board file is durably written.
 * `full` lines carry every check of the board; the others only the checks that
 * write changed, and `prev`, the stamp of the version they changed, so a reader
 * can tell when a line is missing from the chain (a crash between the board
 * write and the append) and read that board again instead of trusting a gap.
 */
export interface JournalLine {
  readonly serial: string;
  readonly stamp: string;
  readonly prev: string | null;
  readonly full: boolean;
  readonly head: BoardHead;
  readonly checks: CheckMap;
}

/** A board as the reader knows it after the snapshot and the journal. */
export interface KnownBoard {
  head: BoardHead;
  stamp: string;
  /** Every check, when known in full (a full line or a board read again); else the snapshot's checks apply. */
  full: CheckMap | null;
  /** Changed checks after the snapshot's, oldest first. */
  deltas: CheckMap[];
  /** A line is missing from the chain: read the board file again. */
  broken: boolean;
}

export function headOf(summary: BoardSummary): BoardHead {
  const { checks: _checks, ...head } = summary;
  return head;
}

/** Turn the `"Infinity"` strings of log JSON back into numbers in a check map (cheaper than a reviver on every key). */
export function reviveChecks(checks: CheckMap): CheckMap {
  for (const c of Object.values(checks)) {
    for (const point of [c.first, c.latest] as { value: number | string }[]) {
      if (point.value === 'Infinity') point.value = Infinity;
      else if (point.value === '-Infinity') point.value = -Infinity;
    }
  }
  return checks;
}

function isLine(data: unknown): data is JournalLine {
  if (typeof data !== 'object' || data === null) return false;
  const d = data as Partial<JournalLine>;
  return typeof d.serial === 'string' && typeof d.stamp === 'string' && (d.prev === null || typeof d.prev === 'string') && typeof d.full === 'boolean' && typeof d.head === 'object' && d.head !== null && typeof d.checks === 'object' && d.checks !== null;
}

/** Apply the journal's lines, in order, to what the snapshot said. Torn or foreign lines are skipped. */
export function replayJournal(text: string, known: Map<string, KnownBoard>): void {
  for (const raw of text.split('\n')) {
    if (raw === '') continue;
    let data: unknown;
    try {
      data = JSON.parse(raw);
    } catch {
      continue; // a torn last line (a crash mid-append): the stamp check repairs its board
    }
    if (!isLine(data)) continue;
    const line = data;
    const checks = reviveChecks(line.checks);
    const was = known.get(line.serial);
    if (line.full) {
      known.set(line.serial, { head: line.head, stamp: line.stamp, full: checks, deltas: [], broken: false });
    } else if (was && !was.broken && was.stamp === line.prev) {
      was.head = line.head;
      was.stamp = line.stamp;
      if (was.full) Object.assign(was.full, checks);
      else was.deltas.push(checks);
    } else {
      known.set(line.serial, { head: line.head, stamp: line.stamp, full: null, deltas: [], broken: true });
    }
  }
}
