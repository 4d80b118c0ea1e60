import type { Verdict } from '../analysis/types.js';
import type { Unit } from '../units/unit.js';

/** Board file schema version; older files are migrated on read, newer ones refused. */
export const boardSchemaVersion = 1;

/** One reading, as saved (DESIGN §6, §7). */
export interface Reading {
  readonly id: string;
  readonly run: string;
  readonly check: string;
  /** SI base units. */
  readonly value: number;
  readonly unit: Unit;
  /** The text as typed (or the capture figure's name). */
  readonly raw: string;
  /** ISO 8601. */
  readonly at: string;
  readonly operator: string;
  readonly verdict: Verdict;
  /** sha256 of the plan text the verdict was computed against. */
  readonly planHash: string;
  /** `captures/<hash>.<ext>` name when the value came from a capture. */
  readonly capture?: string;
  /** Suspect-but-usable notes (skipped safety checks, instrument too coarse). */
  readonly warnings?: readonly string[];
  /** The bench instrument the value was read from (`record --from`), with its `*IDN?` answer. */
  readonly instrument?: InstrumentRef;
}

/** Which instrument gave a reading. */
export interface InstrumentRef {
  readonly name: string;
  readonly identity: string | null;
}

export type RunOutcome = 'in-progress' | 'passed' | 'failed' | 'aborted' | 'power-off';

export interface Run {
  readonly id: string;
  readonly started: string;
  readonly ended: string | null;
  readonly operator: string;
  readonly outcome: RunOutcome;
  readonly plan: string;
  readonly planHash: string;
}

export interface Rework {
  readonly id: string;
  readonly at: string;
  readonly run: string | null;
  /** `<stage>.<role>`, e.g. `osc.Ct`. */
  readonly part: string;
  readonly from: string;
  readonly to: string;
  readonly note: string;
  readonly operator: string;
}

export interface CaptureRef {
  /** `<sha256>.<ext>`, the file name under `captures/`. */
  readonly file: string;
  /** The name the file had when attached. */
  readonly name: string;
  readonly at: string;
  readonly check: string | null;
  readonly run: string | null;
}

/** `boards/<serial>.json`. */
export interface BoardFile {
  readonly schemaVersion: number;
  readonly serial: string;
  /** The plan id of the board's latest run, or null before any. */
  readonly plan: string | null;
  readonly runs: readonly Run[];
  readonly readings: readonly Reading[];
  readonly rework: readonly Rework[];
  readonly captures: readonly CaptureRef[];
}

export type BoardState = 'untouched' | 'in-progress' | 'passed' | 'failed' | 'reworked';

/** First and latest reading of one check on one board. */
export interface CheckSummary {
  readonly first: { readonly value: number; readonly verdict: Verdict; readonly at: string };
  readonly latest: { readonly value: number; readonly verdict: Verdict; readonly at: string };
  readonly count: number;
}

/** One board in the index: enough for the bench screen and batch figures. */
export interface BoardSummary {
  readonly serial: string;
  readonly plan: string | null;
  readonly planHash: string | null;
  readonly state: BoardState;
  readonly lastRunAt: string | null;
  readonly runs: number;
  readonly readings: number;
  readonly rework: number;
  readonly checks: Readonly<Record<string, CheckSummary>>;
}

/** `index.json`: a rebuildable summary of every board. */
export interface LogIndex {
  readonly schemaVersion: number;
  readonly boards: Readonly<Record<string, BoardSummary>>;
  /** Board files that could not be read (damaged, newer schema), each with its one-line message and remedy. */
  readonly damaged?: readonly DamagedBoard[];
  /**
   * The per-check summaries as columns, when the store keeps them so (a folder
   * log); not enumerable, so an index still prints and compares as before.
   */
  readonly checkColumns?: CheckColumns;
}

/**
 * Every board's per-check summaries as columns (rows grouped by board): what a
 * batch review reads instead of one object per board and check. A folder log
 * offers it beside `boards`; a board whose summaries changed since its columns
 * were written has none (`rowsOf` gives -1) and is read from its `checks`.
 */
export interface CheckColumns {
  readonly checkIds: readonly string[];
  /** Board position of a serial in `rowStart`, or -1 when the columns do not hold that board as it is now. */
  rowsOf(serial: string): number;
  /** Board b's rows are `rowStart[b]` up to `rowStart[b + 1]`. */
  readonly rowStart: Uint32Array;
  /** Index into `checkIds`, per row. */
  readonly checkOf: Uint32Array;
  /** The latest reading's value, SI units. */
  readonly latestValue: Float64Array;
  /** The latest reading's time, ms since epoch; NaN when its text is not the canonical ISO form (then see `latestAt`). */
  readonly latestAtMs: Float64Array;
  /** Verdict codes 0 pass, 1 marginal, 2 fail: the latest in bits 0–1, the first in bits 2–3. */
  readonly verdicts: Uint8Array;
  /** The latest reading's time as stored (ISO 8601 text). */
  latestAt(row: number): string;
  /** One board's summaries as objects, or null when the columns do not hold it. */
  checksOf(serial: string): Record<string, CheckSummary> | null;
}

/** A board file the index could not read; its summary (if listed) is from its last good version. */
export interface DamagedBoard {
  readonly serial: string;
  readonly message: string;
}

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
