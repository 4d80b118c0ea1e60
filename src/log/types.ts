import type { Verdict } from '../analysis/types.js';
import type { Unit } from '../units/unit.js';
import type { BoardHead } from './index-journal.js';
import type { Reading, InstrumentRef, RunOutcome, Run, Rework, CaptureRef, BoardFile, LogIndex } from '../analysis/records.js';

export type { BoardHead } from './index-journal.js';

/**
 * The first boards of the index in order of latest activity (`byActivity`),
 * read without the rest: what a screen draws before the whole index is read.
 * Taken from the last snapshot with the journal's later lines on top; a board
 * file changed by hand since (copied in, restored) shows only in the full index.
 */
export interface IndexHead {
  readonly boards: readonly BoardHead[];
  /** Whether these are all the boards the snapshot and journal know (the log has no more). */
  readonly isWhole: boolean;
}

/** Board file schema version; older files are migrated on read, newer ones refused. */
export const boardSchemaVersion = 1;
export type {
  Reading,
  InstrumentRef,
  RunOutcome,
  Run,
  Rework,
  CaptureRef,
  BoardFile,
  BoardState,
  CheckSummary,
  BoardSummary,
  LogIndex,
  CheckColumns,
  DamagedBoard,
} from '../analysis/records.js';

/** What a caller gives to save a reading; the store adds id, time and plan hash checks. */
export interface ReadingInput {
  readonly run: string;
  readonly check: string;
  readonly value: number;
  readonly unit: Unit;
  readonly raw: string;
  readonly operator: string;
  readonly verdict: Verdict;
  readonly planHash: string;
  readonly capture?: string;
  readonly warnings?: readonly string[];
  readonly instrument?: InstrumentRef;
}

/**
 * The bench log (DESIGN §6), implemented in `src/log/store.ts` (`openLog(dir)`).
 * Every write is durable when its promise resolves; concurrent processes are safe.
 */
export interface BenchLog {
  readonly dir: string;
  /** The index, rebuilt first when missing or stale. */
  readIndex(): Promise<LogIndex>;
  /**
   * The first `count` boards by latest activity, read at once and cheaply (a
   * folder log keeps them at the top of its index), or null when the store
   * keeps none (then `readIndex`). Never instead of `readIndex`: only before it.
   */
  readIndexHead?(count: number): IndexHead | null;
  /** A board's file, or null when the board has none yet. Throws on a damaged file. */
  readBoard(serial: string): Promise<BoardFile | null>;
  /** Start a run (creating the board when new); saves the plan snapshot. */
  startRun(serial: string, run: { plan: string; planHash: string; planText: string; operator: string }): Promise<Run>;
  endRun(serial: string, runId: string, outcome: RunOutcome): Promise<Run>;
  appendReading(serial: string, reading: ReadingInput): Promise<Reading>;
  addRework(serial: string, rework: Omit<Rework, 'id' | 'at'>): Promise<Rework>;
  /** The exact plan text of a snapshot, or null. */
  readPlanSnapshot(hash: string): Promise<string | null>;
  /** Copy a capture into the log by content hash; returns its ref (not yet linked to a board). */
  saveCapture(bytes: Uint8Array, name: string): Promise<{ file: string }>;
  linkCapture(serial: string, ref: CaptureRef): Promise<void>;
  /** The bytes of a saved capture (`<sha256>.<ext>`), or null when the log does not hold it. */
  readCapture(file: string): Promise<Uint8Array | null>;
}
