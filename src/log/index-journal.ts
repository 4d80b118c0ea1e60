import type { BoardSummary, CheckSummary } from './types.js';

/** A board's line in the index without its per-check summaries (kept apart, loaded on demand). */
export type BoardHead = Omit<BoardSummary, 'checks'>;
export type CheckMap = Record<string, CheckSummary>;

/**
 * One line of `index.journal`, appended after a board file is durably written.
 * `full` lines carry every check of the board; the others only the checks that
 * write changed, and `prev`, the stamp of the version they changed, so a reader
 * can tell when a line is missing from the chain and read that board again
 * instead of trusting a gap. `dir` is the boards folder's time after the write
 * and `boot` this boot of the machine (see `readIndex`'s quick path); `nonce`
 * closes the writer's intent line.
 */
export interface JournalLine {
  readonly serial: string;
  readonly stamp: string;
  readonly prev: string | null;
  readonly full: boolean;
  readonly head: BoardHead;
  readonly checks: CheckMap;
  readonly nonce?: string;
  readonly dir?: number | null;
  readonly boot?: string;
}

/** Written before a board file is replaced; a reader that finds no line closing it checks that board. */
export interface IntentLine {
  readonly intent: string;
  readonly serial: string;
}

/** A board a reader could not read (damaged): every later reader checks it again. */
export interface SuspectLine {
  readonly suspect: string;
  readonly dir: number | null;
  readonly boot: string;
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

/** What the journal says beyond the boards: for the quick path of `readIndex`. */
export interface JournalFacts {
  /** The latest boards-folder time a line recorded, or null. */
  dir: number | null;
  /** Boot ids the lines were written under. */
  boots: Set<string>;
  /** Boards that may have changed without a line saying how: open intents, damaged boards. */
  suspects: Set<string>;
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

function isLine(d: Partial<JournalLine>): d is JournalLine {
  return (
    typeof d.serial === 'string' &&
    typeof d.stamp === 'string' &&
    (d.prev === null || typeof d.prev === 'string') &&
    typeof d.full === 'boolean' &&
    typeof d.head === 'object' &&
    d.head !== null &&
    typeof d.checks === 'object' &&
    d.checks !== null
  );
}

/** Apply the journal's lines, in order, to what the snapshot said. Torn or foreign lines are skipped. */
export function replayJournal(text: string, known: Map<string, KnownBoard>): JournalFacts {
  const facts: JournalFacts = { dir: null, boots: new Set(), suspects: new Set() };
  const intents = new Map<string, string>();
  const note = (dir: number | null | undefined, boot: string | undefined) => {
    if (typeof dir === 'number') facts.dir = Math.max(facts.dir ?? dir, dir);
    if (typeof boot === 'string') facts.boots.add(boot);
  };
  for (const raw of text.split('\n')) {
    if (raw === '') continue;
    let data: Record<string, unknown>;
    try {
      data = JSON.parse(raw) as Record<string, unknown>;
    } catch {
      // A torn line (a process killed mid-append): a writer's intent stays open and
      // marks its board; a reader's lost line only costs the next reader a check.
      continue;
    }
    if (typeof data !== 'object' || data === null) continue;
    if (typeof data.intent === 'string' && typeof data.serial === 'string') {
      intents.set(data.intent, data.serial);
      continue;
    }
    if (typeof data.suspect === 'string') {
      facts.suspects.add(data.suspect);
      note(data.dir as number | null, data.boot as string);
      continue;
    }
    if (!isLine(data)) continue;
    const line = data;
    if (line.nonce) intents.delete(line.nonce);
    note(line.dir, line.boot);
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
  for (const serial of intents.values()) facts.suspects.add(serial);
  return facts;
}
