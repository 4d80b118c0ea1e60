import { statSync } from 'node:fs';
import { readdir, readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { Low } from 'lowdb';
import { BoardFileAdapter } from './board-file-adapter.js';
import { captureExtension, ContentStore } from './content-store.js';
import { errorCode, ioFailure, LogInputError, LogMissingError } from './errors.js';
import { ensureFolder } from './folder.js';
import { withFileLock } from './file-lock.js';
import {
  addReworkChange,
  appendReadingChange,
  appendToOpenRunChange,
  type AppendResult,
  type BoardChange,
  checkRework,
  emptyBoard as emptyBoardOf,
  endRunChange,
  linkCaptureChange,
  type MergeCounts,
  mergeBoardChange,
  startRunChange,
} from './board-changes.js';
import { fileStamp, IndexStore, type IndexProgress, type IndexReadOptions, journalLimitBytes } from './index-store.js';
import { validateSerial } from './serial.js';
import {
  type BenchLog,
  type BoardFile,
  boardSchemaVersion,
  type CaptureRef,
  type IndexHead,
  type LogIndex,
  type Reading,
  type ReadingInput,
  type Rework,
  type Run,
  type RunOutcome,
} from './types.js';
import { checkReadingInput, checkRunEnd, checkRunStart, checkSerial, type RunStart } from './validate-input.js';

export type { AppendResult } from './board-changes.js';

/** How a log talks back while it works. */
export interface LogOptions {
  /** Told at once (one line) when a board's lock is held by another process and the write waits for it. */
  readonly onLockWait?: (message: string) => void;
}

/** The bench log with the extras the commands use on top of the shared interface. */
export interface LogStore extends BenchLog {
  /** The index; `onProgress` hears about boards read again while it is rebuilt; `verify` checks every board file. */
  readIndex(onProgress?: IndexProgress, options?: IndexReadOptions): Promise<LogIndex>;
  /** The first boards by latest activity, read at once (see `BenchLog`); null when the store keeps no such head. */
  readIndexHead(count: number): IndexHead | null;
  /**
   * Save a reading into the board's open run, starting one first when none is
   * open, in one locked step (two terminals cannot both start a run).
   * `warningsFor` adds warnings judged from the board as it is under the lock
   * (e.g. the run's readings so far), so they never come from a stale copy.
   */
  appendToOpenRun(
    serial: string,
    run: RunStart,
    reading: Omit<ReadingInput, 'run'>,
    warningsFor?: (board: BoardFile, run: Run) => readonly string[],
  ): Promise<AppendResult>;
  /** The path of a board's file (for messages). */
  boardPath(serial: string): string;
  /** Every board serial in the log (for `log copy`). */
  listSerials(): Promise<string[]>;
  /**
   * Merge a board copied from another log with the plan snapshots and capture
   * bytes it refers to (`log copy`): by id, idempotent.
   */
  mergeBoard(source: BoardFile, plans: ReadonlyMap<string, string>, captures: ReadonlyMap<string, Uint8Array>): Promise<MergeCounts>;
  /** Release connections (a database); nothing to do for a folder. */
  close(): Promise<void>;
}

export function emptyBoard(serial: string): BoardFile {
  return emptyBoardOf(serial, boardSchemaVersion);
}

class Store implements LogStore {
  readonly #boards: string;
  readonly #plans: ContentStore;
  readonly #captures: ContentStore;
  readonly #index: IndexStore;

  constructor(
    readonly dir: string,
    readonly options: LogOptions = {},
  ) {
    this.#boards = join(dir, 'boards');
    this.#plans = new ContentStore(join(dir, 'plans'));
    this.#captures = new ContentStore(join(dir, 'captures'));
    this.#index = new IndexStore(dir, this.#boards, (serial) => this.readBoard(serial));
  }

  boardPath(serial: string): string {
    return join(this.#boards, `${serial}.json`);
  }

  readIndexHead(count: number): IndexHead | null {
    return this.#index.readHead(count);
  }

  readIndex(onProgress?: IndexProgress, options?: IndexReadOptions): Promise<LogIndex> {
    return this.#index.read(onProgress, options).catch((error: unknown) => {
      throw ioFailure(error, `cannot read the index of the log ${this.dir}`);
    });
  }

  async readBoard(serial: string): Promise<BoardFile | null> {
    checkSerial(serial);
    try {
      return await new BoardFileAdapter(this.boardPath(serial), serial).read();
    } catch (error) {
      throw ioFailure(error, `cannot read board ${serial}`, this.boardPath(serial));
    }
  }

  /** Read, change and durably write one board under its lock; then note it in the index journal. */
  async #update<T>(serial: string, change: (board: BoardFile) => BoardChange<T>): Promise<T> {
    checkSerial(serial);
    const path = this.boardPath(serial);
    // Locks live apart from the boards so that taking one leaves the boards folder's time alone (the index's quick path).
    // A file-system failure anywhere in the step is one line with the remedy (no raw `EPERM … .tmp` path).
    const saving = `cannot save board ${serial} in the log ${this.dir}`;
    const lockOptions = this.options.onLockWait
      ? { onWait: (who: string) => this.options.onLockWait?.(`board ${serial} is busy: waiting for ${who} (up to 30 s)`) }
      : {};
    const { result, journalBytes } = await withFileLock(
      join(this.dir, 'locks', `${serial}.json`),
      async () => {
        const db = new Low<BoardFile>(new BoardFileAdapter(path, serial), emptyBoard(serial));
        await db.read();
        const prev = fileStamp(path);
        const next = change(db.data);
        db.data = next.board;
        const nonce = this.#index.intend(serial);
        await db.write();
        const stamp = fileStamp(path);
        if (stamp === null) throw new Error(`board file ${path} vanished right after it was written`);
        return { result: next.result, journalBytes: this.#index.noteBoard(next.board, stamp, prev, next.touched ?? [], nonce).journalBytes };
      },
      lockOptions,
    ).catch((error: unknown) => {
      throw ioFailure(error, saving);
    });
    if (journalBytes > journalLimitBytes)
      await this.#index.read().catch((error: unknown) => {
        throw ioFailure(error, `board ${serial} is saved, but the index of ${this.dir} could not be updated`);
      });
    return result;
  }

  #savePlan(start: RunStart): void {
    checkRunStart(start);
    try {
      this.#plans.put(start.planText, 'json', start.planHash);
    } catch (error) {
      throw ioFailure(error, `cannot keep the plan snapshot in the log ${this.dir}`);
    }
  }

  #checkPlanKept(hash: string): void {
    if (!this.#plans.has(hash, 'json')) throw new LogInputError(`plan ${hash.slice(0, 12)}… is not in the log; start a run with that plan first`);
  }

  async startRun(serial: string, start: RunStart): Promise<Run> {
    this.#savePlan(start);
    return this.#update(serial, startRunChange(start));
  }

  async endRun(serial: string, runId: string, outcome: RunOutcome): Promise<Run> {
    checkRunEnd(outcome);
    return this.#update(serial, endRunChange(serial, runId, outcome));
  }

  async appendReading(serial: string, input: ReadingInput): Promise<Reading> {
    checkReadingInput(input);
    this.#checkPlanKept(input.planHash);
    return this.#update(serial, appendReadingChange(serial, input));
  }

  async appendToOpenRun(
    serial: string,
    start: RunStart,
    input: Omit<ReadingInput, 'run'>,
    warningsFor?: (board: BoardFile, run: Run) => readonly string[],
  ): Promise<AppendResult> {
    this.#savePlan(start);
    checkReadingInput({ ...input, run: 'pending' });
    return this.#update(serial, appendToOpenRunChange(start, input, warningsFor));
  }

  async addRework(serial: string, note: Omit<Rework, 'id' | 'at'>): Promise<Rework> {
    checkRework(note);
    return this.#update(serial, addReworkChange(serial, note));
  }

  async mergeBoard(source: BoardFile, plans: ReadonlyMap<string, string>, captures: ReadonlyMap<string, Uint8Array>): Promise<MergeCounts> {
    checkSerial(source.serial);
    for (const [hash, text] of plans) if (!this.#plans.has(hash, 'json')) this.#plans.put(text, 'json', hash);
    for (const [file, bytes] of captures) {
      const [hash, ext] = file.split('.');
      if (hash && ext && !this.#captures.has(hash, ext)) this.#captures.put(bytes, ext, hash);
    }
    return this.#update(source.serial, mergeBoardChange(source));
  }

  async readCapture(file: string): Promise<Uint8Array | null> {
    const m = /^([0-9a-f]{64})\.([a-z0-9]{1,8})$/.exec(file);
    if (!m) return null;
    try {
      return new Uint8Array(await readFile(join(this.dir, 'captures', file)));
    } catch (error) {
      if (errorCode(error) === 'ENOENT') return null;
      throw error;
    }
  }

  async listSerials(): Promise<string[]> {
    let names: string[];
    try {
      names = await readdir(this.#boards);
    } catch (error) {
      if (errorCode(error) === 'ENOENT') return [];
      throw error;
    }
    return names
      .filter((n) => n.endsWith('.json'))
      .map((n) => n.slice(0, -5))
      .filter((s) => validateSerial(s) === null)
      .sort();
  }

  async close(): Promise<void> {}

  async readPlanSnapshot(hash: string): Promise<string | null> {
    return this.#plans.getText(hash, 'json');
  }

  async saveCapture(bytes: Uint8Array, name: string): Promise<{ file: string }> {
    try {
      return { file: this.#captures.put(bytes, captureExtension(name)) };
    } catch (error) {
      throw ioFailure(error, `cannot keep the capture ${name} in the log ${this.dir}`);
    }
  }

  async linkCapture(serial: string, ref: CaptureRef): Promise<void> {
    const [hash, ext] = ref.file.split('.');
    if (!hash || !ext || !this.#captures.has(hash, ext)) throw new LogInputError(`capture ${ref.file} is not in the log; save it first`);
    await this.#update(serial, linkCaptureChange(ref));
  }
}

export interface OpenLogOptions extends LogOptions {
  /**
   * For commands that only read (history, report, batch): the log must exist
   * already, and opening it creates no folder or file, so a mistyped --log
   * leaves nothing behind. @default false
   */
  readonly isReadOnly?: boolean;
}

/** A log folder as `openLog` makes it (it always has `boards/`), or a `LogMissingError` saying what is there instead. */
function checkExistingLog(root: string): void {
  let isFolder: boolean;
  try {
    isFolder = statSync(root).isDirectory();
  } catch (error) {
    if (errorCode(error) === 'ENOENT' || errorCode(error) === 'ENOTDIR')
      throw new LogMissingError(root, `there is no log at ${root}; check --log (or $PROBEBOOK_LOG), or record a reading first`);
    throw error;
  }
  if (!isFolder) throw new LogMissingError(root, `${root} is a file, not a log folder; check --log (or $PROBEBOOK_LOG)`);
  let hasBoards = false;
  try {
    hasBoards = statSync(join(root, 'boards')).isDirectory();
  } catch (error) {
    if (errorCode(error) !== 'ENOENT' && errorCode(error) !== 'ENOTDIR') throw error;
  }
  if (!hasBoards) throw new LogMissingError(root, `${root} is not a probebook log (it has no boards folder); check --log (or $PROBEBOOK_LOG)`);
}

/**
 * Open (creating when needed) the bench log in `dir` (DESIGN §6):
 * - `boards/<serial>.json`: one board's runs, readings, rework notes and captures
 *   (schema version in the file; older versions migrate on read, newer ones are
 *   refused), the previous version kept as `<serial>.json.bak`;
 * - `plans/<sha256>.json`: the exact plan text each run used;
 * - `captures/<sha256>.<ext>`: raw capture files, by content;
 * - `index.json`, `index-checks.<gen>.bin`, `index.journal`: the rebuildable
 *   index (see `IndexStore`).
 * Every change to a board happens under that board's lock (`locks/<serial>.json.lock`)
 * as read → change → durable replace, so concurrent processes lose nothing and
 * a write is on disk when its promise resolves. A damaged board file throws a
 * `LogDamageError` (one line: file, place, remedy; the commands exit 1 with it)
 * and is never written over.
 */
export async function openLog(dir: string, options: OpenLogOptions = {}): Promise<LogStore> {
  const root = resolve(dir);
  if (options.isReadOnly) {
    checkExistingLog(root);
    return new Store(root, options);
  }
  ensureFolder(root);
  for (const sub of ['boards', 'plans', 'captures', 'locks']) ensureFolder(join(root, sub));
  return new Store(root, options);
}
