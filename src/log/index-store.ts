import { appendFileSync, closeSync, openSync, readdirSync, readFileSync, readSync, renameSync, statSync, unlinkSync } from 'node:fs';
export { fileStamp } from './board-scan.js';
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import { readBoardFileSync } from './board-file-adapter.js';
import { DurableTextFile } from './durable-text-file.js';
import { errorCode, LogDamageError } from './errors.js';
import { readTextIfAny } from './read-text.js';
import { decodeCheckColumns, encodeCheckColumns } from './check-columns.js';
import { withFileLock } from './file-lock.js';
import { boardSerials, bootId, folderTime, stampsOf } from './board-scan.js';
import { type BoardHead, type CheckMap, headOf, type IntentLine, type JournalLine, type KnownBoard, replayJournal, type SuspectLine } from './index-journal.js';
import { packBoards, type PackedBoards, unpackBoards } from './index-rows.js';
import { toLogJson } from './json-text.js';
import { summarizeBoard } from './summary.js';
import { byActivity } from './board-order.js';
import type { BoardFile, BoardSummary, CheckColumns, DamagedBoard, IndexHead, LogIndex } from './types.js';

/** Version of the index files (a cache: any other version is rebuilt, never refused). */
export const indexSchemaVersion = 5;

/** Called while boards are read to rebuild the index: `done` of `total` board files. */
export type IndexProgress = (done: number, total: number) => void;

export interface IndexReadOptions {
  /**
   * Check every board file's stamp, never the quick path: a review that judges a
   * batch must not count a board from its summary when its file changed by hand
   * (one `stat` per board). @default false
   */
  readonly verify?: boolean;
}

/** Compact the journal into the snapshot once it grows past this many bytes. */
export const journalLimitBytes = 1024 * 1024;

/** Boards read again in one go above which the reader writes a new snapshot instead of journal lines. */
const rereadsBeforeCompact = 100;

/** The per-check columns file of a snapshot; the older JSON form is only ever deleted. */
const checksPattern = /^index-checks\.[0-9a-f]+\.bin$/;
const anyChecksPattern = /^index-checks\.[0-9a-f]+\.(bin|json)$/;

/**
 * Boards kept at the top of `index.json` in order of latest activity (`byActivity`),
 * for `readHead`: more than a tall terminal shows.
 */
export const headRows = 200;

/** The snapshot's first line, `{"head":…,`, is read alone up to this many bytes (200 rows take about 25 kB). */
const headLineLimit = 1 << 20;
const headPrefix = '{"head":';

/** The first boards of a snapshot by latest activity, and how many boards it holds in all. */
interface SnapshotHead {
  readonly total: number;
  readonly boards: PackedBoards;
}

interface Snapshot {
  /** The first boards by latest activity (written on the snapshot's first line; absent in older snapshots). */
  readonly head?: SnapshotHead;
  readonly schemaVersion: number;
  /** Each board's counts and state (no checks) and the stamp of the board file it was made from, packed. */
  readonly boards: PackedBoards;
  /** The file holding every board's per-check summaries, written with this snapshot. */
  readonly checksFile: string;
  /** The boards folder's time when the boards were last all checked, and the boot it was on. */
  readonly dir: number | null;
  readonly boot: string;
  /** Boards that could not be read (damaged): checked on every read. */
  readonly suspects: readonly string[];
}

/**
 * The index: a rebuildable summary of every board, cheap to keep at thousands
 * of boards. Three files:
 * - `index.json`, the snapshot: each board's counts and state (no checks) and the
 *   stamp of the board file it was made from;
 * - `index-checks.<gen>.bin`, every board's first/latest reading per check as
 *   columns of numbers (`check-columns.ts`), written with the snapshot and read
 *   only when a caller looks at `checks` or `checkColumns` (the bench screen
 *   never does; the batch review does). A damaged one is refused (checksum) and,
 *   on a verifying read, rebuilt from the board files;
 * - `index.journal`: writers never rewrite the snapshot; before each board write
 *   they append an intent line, after it one line (the board's counts, the
 *   checks that changed, the old and new stamps, the boards folder's time).
 * Readers take the snapshot, replay the journal, and check the board files: a
 * board whose stamp differs (a crash between the two writes, a file restored
 * from `.bak`, a board copied in) or whose journal chain has a gap is read
 * again. Every board file is stat'ed unless the journal accounts for the boards
 * folder's latest change (see `read`). A long journal is folded into a new
 * snapshot. Deleting all of them loses nothing: the next read rebuilds them
 * from the board files.
 *
 * Known limit of the quick path: a board file rewritten in place by hand (its
 * folder untouched, e.g. an editor saving over it) is seen at the next full
 * check, not before; restores are therefore advised as copy-then-rename.
 */
export class IndexStore {
  readonly file: string;
  readonly journal: string;

  constructor(
    readonly dir: string,
    private readonly boardsDir: string,
    private readonly readBoard: (serial: string) => Promise<BoardFile | null>,
  ) {
    this.file = join(dir, 'index.json');
    this.journal = join(dir, 'index.journal');
  }

  /** Say a board is about to be replaced (before its rename); returns the nonce `noteBoard` closes it with. */
  intend(serial: string): string {
    const nonce = randomBytes(6).toString('hex');
    appendFileSync(this.journal, `${JSON.stringify({ intent: nonce, serial } satisfies IntentLine)}\n`);
    return nonce;
  }

  /**
   * Note a board's new version; call after its file is durably written, under
   * its lock. `touched` names the checks the write changed (`'all'` to send them all).
   */
  noteBoard(board: BoardFile, stamp: string, prev: string | null, touched: readonly string[] | 'all', nonce: string): { journalBytes: number } {
    const summary = summarizeBoard(board);
    const full = touched === 'all' || prev === null;
    const checks: CheckMap = full ? summary.checks : Object.fromEntries(touched.flatMap((c) => (summary.checks[c] ? [[c, summary.checks[c]]] : [])));
    const line: JournalLine = {
      serial: board.serial,
      stamp,
      prev,
      full,
      head: headOf(summary),
      checks,
      nonce,
      dir: folderTime(this.boardsDir),
      boot: bootId(),
    };
    appendFileSync(this.journal, `${toLogJson(line)}\n`);
    return { journalBytes: statSync(this.journal).size };
  }

  /**
   * The index. Every board file is checked (one `stat` each) unless the quick
   * path holds: the journal accounts for the boards folder's latest change, no
   * writer left an intent open, and the machine has not rebooted since; then
   * only new, vanished, damaged and half-written boards are looked at.
   */
  async read(onProgress?: IndexProgress, options: IndexReadOptions = {}): Promise<LogIndex> {
    const startDir = folderTime(this.boardsDir);
    const boot = bootId();
    const snapshot = this.#readSnapshot();
    const known = new Map<string, KnownBoard>();
    for (const [serial, head, stamp] of snapshot?.rows ?? []) known.set(serial, { head, stamp, full: null, deltas: [], broken: false });
    const journalText = readTextIfAny(this.journal) ?? '';
    const facts = replayJournal(journalText, known);
    for (const s of snapshot?.suspects ?? []) facts.suspects.add(s);
    const lastDir = Math.max(snapshot?.dir ?? -1, facts.dir ?? -1);
    const isQuick =
      options.verify !== true &&
      snapshot !== null &&
      snapshot.boot === boot &&
      [...facts.boots].every((b) => b === boot) &&
      startDir !== null &&
      lastDir === startDir;

    const serials = boardSerials(this.boardsDir);
    const present = new Set(serials);
    for (const serial of known.keys()) if (!present.has(serial)) known.delete(serial);
    const toCheck = isQuick ? serials.filter((s) => !known.has(s) || facts.suspects.has(s) || known.get(s)?.broken) : serials;
    const stale = [...stampsOf(this.boardsDir, toCheck)].filter(([serial, stamp]) => {
      const k = known.get(serial);
      return !k || k.broken || k.stamp !== stamp;
    });

    const damaged: DamagedBoard[] = [];
    const lines: string[] = [];
    const columns = this.#columnsLoader(snapshot);
    // A verifying read (the batch review) needs the columns anyway: a missing or damaged file is rebuilt now.
    const isColumnsLost = options.verify === true && snapshot !== null && columns() === null;
    const shouldCompact =
      snapshot === null || snapshot.head === undefined || isColumnsLost || stale.length > rereadsBeforeCompact || journalText.length > journalLimitBytes;
    if (stale.length > 0) onProgress?.(0, stale.length);
    let done = 0;
    for (const [serial, stamp] of stale) {
      try {
        const board = await this.readBoard(serial);
        if (board) {
          const summary = summarizeBoard(board);
          known.set(serial, { head: headOf(summary), stamp, full: summary.checks, deltas: [], broken: false });
          if (!shouldCompact)
            lines.push(
              `${toLogJson({ serial, stamp, prev: null, full: true, head: headOf(summary), checks: summary.checks, dir: startDir, boot } satisfies JournalLine)}\n`,
            );
        }
      } catch (error) {
        if (!(error instanceof LogDamageError)) throw error;
        damaged.push({ serial, message: error.message });
        if (!shouldCompact) lines.push(`${JSON.stringify({ suspect: serial, dir: startDir, boot } satisfies SuspectLine)}\n`);
      }
      done++;
      if (onProgress && (done % 100 === 0 || done === stale.length)) onProgress(done, stale.length);
    }
    if (lines.length > 0) await this.#tryWrite(() => appendFileSync(this.journal, lines.join('')));

    const boards: Record<string, BoardSummary> = {};
    const checksOf = this.#checksResolver(columns);
    for (const [serial, k] of known) boards[serial] = lazySummary(k.head, () => checksOf(serial, k));
    let index: LogIndex = damaged.length > 0 ? { schemaVersion: indexSchemaVersion, boards, damaged } : { schemaVersion: indexSchemaVersion, boards };
    if (shouldCompact) {
      const written = await this.#compact(boards, known, snapshot, { dir: startDir, boot, suspects: damaged.map((d) => d.serial) });
      if (written) index = withColumns(index, () => written, known);
    } else {
      index = withColumns(index, columns, known);
    }
    return index;
  }

  /**
   * The first `count` boards by latest activity without reading the whole index:
   * the snapshot's first line and the journal's lines since. No board file is
   * looked at, so a file changed by hand since shows only in `read`; null when
   * there is no snapshot with a head (then only `read` answers). Never throws:
   * `read` reports what is wrong.
   */
  readHead(count: number): IndexHead | null {
    try {
      const line = readFirstLine(this.file, headLineLimit);
      if (line === null || !line.startsWith(headPrefix) || !line.endsWith(',')) return null;
      const head = JSON.parse(line.slice(headPrefix.length, -1)) as Partial<SnapshotHead> | null;
      if (!head || typeof head.total !== 'number' || typeof head.boards !== 'object' || head.boards === null) return null;
      const rows = unpackBoards(head.boards);
      if (!rows) return null;
      const known = new Map<string, KnownBoard>();
      for (const [serial, h, stamp] of rows) known.set(serial, { head: h, stamp, full: null, deltas: [], broken: false });
      // A board written since the snapshot comes first again (its run is the latest); one outside the head moves into it.
      replayJournal(readTextIfAny(this.journal) ?? '', known);
      const boards = [...known.values()].map((k) => k.head).sort(byActivity);
      return { boards: boards.slice(0, count), isWhole: head.total <= rows.length && boards.length <= count };
    } catch {
      return null;
    }
  }

  /** The snapshot's columns file, read (and checked) the first time it is asked for; null when gone or damaged. */
  #columnsLoader(snapshot: Snapshot | null): () => CheckColumns | null {
    let stored: CheckColumns | null | undefined;
    return () => {
      if (stored === undefined) stored = snapshot ? this.#readChecks(snapshot.checksFile) : null;
      return stored;
    };
  }

  /** How a board's checks are found when asked for: in full, or the snapshot's with the journal's changes on top. */
  #checksResolver(columns: () => CheckColumns | null): (serial: string, k: KnownBoard) => CheckMap {
    return (serial, k) => {
      if (k.full) return k.full;
      const base = columns()?.checksOf(serial) ?? undefined;
      if (base === undefined) {
        // The checks file is gone or lacks this board (a crash mid-compaction): read the board itself.
        try {
          const board = readBoardFileSync(join(this.boardsDir, `${serial}.json`), serial);
          return board ? summarizeBoard(board).checks : {};
        } catch (error) {
          if (error instanceof LogDamageError) return {};
          throw error;
        }
      }
      return Object.assign({}, base, ...k.deltas) as CheckMap;
    };
  }

  #readSnapshot(): (Snapshot & { rows: ReturnType<typeof unpackBoards> & object }) | null {
    const text = readTextIfAny(this.file);
    if (text === null) return null;
    let data: Partial<Snapshot> | null;
    try {
      data = JSON.parse(text) as Partial<Snapshot> | null;
    } catch {
      return null; // the index is a cache of the board files: a damaged one is rebuilt, not refused
    }
    if (
      !data ||
      data.schemaVersion !== indexSchemaVersion ||
      typeof data.boards !== 'object' ||
      data.boards === null ||
      typeof data.checksFile !== 'string' ||
      !Array.isArray(data.suspects)
    )
      return null;
    const rows = unpackBoards(data.boards);
    return rows ? { ...(data as Snapshot), rows } : null;
  }

  #readChecks(name: string): CheckColumns | null {
    if (!checksPattern.test(name)) return null;
    let bytes: Buffer;
    try {
      bytes = readFileSync(join(this.dir, name));
    } catch (error) {
      if (errorCode(error) === 'ENOENT') return null;
      throw error;
    }
    return decodeCheckColumns(bytes);
  }

  /** Fold the journal into a new snapshot and columns file; returns the columns written, or null when the log is read-only. */
  async #compact(
    boards: Record<string, BoardSummary>,
    known: Map<string, KnownBoard>,
    before: Snapshot | null,
    seen: Pick<Snapshot, 'dir' | 'boot' | 'suspects'>,
  ): Promise<CheckColumns | null> {
    const bytes = encodeCheckColumns([...known.keys()].map((serial) => [serial, boards[serial]?.checks ?? {}] as [string, CheckMap]));
    const rows = [...known].map(([serial, k]) => [serial, k.head, k.stamp] as [string, BoardHead, string]);
    // The rows keep the order the boards were read in (the batch figures sum in that order, and must not
    // change in the last digit between a read that rebuilt the index and the next); only the head is sorted.
    const packed = packBoards(rows);
    const head: SnapshotHead = { total: rows.length, boards: packBoards([...rows].sort((a, b) => byActivity(a[1], b[1])).slice(0, headRows)) };
    const checksFile = `index-checks.${randomBytes(6).toString('hex')}.bin`;
    let isWritten = false;
    await this.#tryWrite(() =>
      withFileLock(this.file, async () => {
        // Lines appended after this move are lost from the journal; their boards'
        // stamps no longer match the snapshot, so the next read reads them again.
        const aside = `${this.journal}.${process.pid}.old`;
        try {
          renameSync(this.journal, aside);
        } catch (error) {
          if (errorCode(error) !== 'ENOENT') throw error;
        }
        const replaced = this.#readSnapshot()?.checksFile ?? before?.checksFile;
        await new DurableTextFile(join(this.dir, checksFile)).write(bytes);
        // Still one JSON document, laid out so its first line is the head alone (`readHead`).
        const rest = JSON.stringify({ schemaVersion: indexSchemaVersion, boards: packed, checksFile, ...seen } satisfies Omit<Snapshot, 'head'>);
        await new DurableTextFile(this.file).write(`${headPrefix}${JSON.stringify(head)},\n${rest.slice(1)}`);
        isWritten = true;
        for (const name of [
          aside,
          ...readdirSync(this.dir)
            .filter((n) => anyChecksPattern.test(n) && n !== checksFile && n !== replaced)
            .map((n) => join(this.dir, n)),
        ]) {
          try {
            unlinkSync(name);
          } catch (error) {
            if (errorCode(error) !== 'ENOENT') throw error;
          }
        }
      }),
    );
    if (!isWritten) return null;
    // Every board's checks are now exactly the file's.
    for (const k of known.values()) {
      k.full = null;
      k.deltas = [];
    }
    return decodeCheckColumns(bytes);
  }

  /** Index writes are a cache: on a log opened read-only they are skipped, the index in memory is still right. */
  async #tryWrite(write: () => unknown): Promise<void> {
    try {
      await write();
    } catch (error) {
      const code = errorCode(error);
      if (code === 'EACCES' || code === 'EROFS' || code === 'EPERM') return;
      throw error;
    }
  }
}

/** A file's first line (without its newline), read no further than `limit` bytes; null when the file is missing or the line longer. */
function readFirstLine(path: string, limit: number): string | null {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
  try {
    let buffer = Buffer.allocUnsafe(64 * 1024);
    let length = 0;
    for (;;) {
      const n = readSync(fd, buffer, length, buffer.length - length, length);
      const end = buffer.subarray(0, length + n).indexOf(0x0a, length);
      length += n;
      if (end >= 0) return buffer.toString('utf8', 0, end);
      if (n === 0 || length >= limit) return null;
      if (length === buffer.length) buffer = Buffer.concat([buffer, Buffer.allocUnsafe(buffer.length)]);
    }
  } finally {
    closeSync(fd);
  }
}

/**
 * The index with its columns (non-enumerable, looked up when first asked for),
 * answering only for boards whose summaries are exactly the file's.
 */
function withColumns(index: LogIndex, columns: () => CheckColumns | null, known: ReadonlyMap<string, KnownBoard>): LogIndex {
  let view: CheckColumns | undefined | null = null;
  return Object.defineProperty(index, 'checkColumns', {
    enumerable: false,
    get: () => {
      if (view !== null) return view;
      const c = columns();
      view = c
        ? {
            ...c,
            rowsOf: (serial: string) => {
              const k = known.get(serial);
              return k && k.full === null && k.deltas.length === 0 && !k.broken ? c.rowsOf(serial) : -1;
            },
          }
        : undefined;
      return view;
    },
  });
}

/** A board summary whose `checks` are looked up the first time they are read. */
function lazySummary(head: BoardHead, checks: () => CheckMap): BoardSummary {
  let cached: CheckMap | undefined;
  // The head is this reader's own object: adding `checks` to it spares a copy per board.
  return Object.defineProperty(head, 'checks', {
    enumerable: true,
    get: () => (cached ??= checks()),
  }) as BoardSummary;
}
