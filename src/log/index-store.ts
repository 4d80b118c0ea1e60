import { appendFileSync, readdirSync, readFileSync, renameSync, statSync, unlinkSync } from 'node:fs';
import { join } from 'node:path';
import { DurableTextFile } from './durable-text-file.js';
import { errorCode, LogDamageError } from './errors.js';
import { withFileLock } from './file-lock.js';
import { fromLogJson, toLogJson } from './json-text.js';
import { validateSerial } from './serial.js';
import { summarizeBoard } from './summary.js';
import type { BoardFile, BoardSummary, LogIndex } from './types.js';

export const indexSchemaVersion = 1;

/** Called while boards are read to rebuild the index: `done` of `total` board files. */
export type IndexProgress = (done: number, total: number) => void;

/** Compact the journal into `index.json` once it grows past this many bytes. */
export const journalLimitBytes = 4 * 1024 * 1024;

/** Temporary files of the durable writes (`<file>.<pid>-<hex>.tmp`); removed once an hour old. */
const leftoverPattern = /\.\d+-[0-9a-f]{8}\.(tmp|baktmp)$/;
const leftoverAgeMs = 60 * 60 * 1000;

interface Snapshot {
  readonly schemaVersion: number;
  readonly boards: Record<string, BoardSummary>;
  /** The board file each summary was made from: `<inode>-<size>-<mtime ms>`. */
  readonly stamps: Record<string, string>;
}

/** The identity of a board file's current version; a rename of a new version changes it. */
export function fileStamp(path: string): string | null {
  try {
    const s = statSync(path, { bigint: true });
    return `${s.ino}-${s.size}-${s.mtimeNs}`;
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}

function readText(path: string): string | null {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}

/**
 * The index (`index.json`): a rebuildable summary of every board, kept cheap to
 * update at thousands of boards. Writers never rewrite it; after each board
 * write they append one line (serial, file stamp, summary) to `index.journal`.
 * Readers load the snapshot, replay the journal, and check every summary's stamp
 * against its board file (one `stat` per board), reading again only the boards
 * that changed behind the index's back (a crash between the two writes, a file
 * restored from `.bak`, a board copied in). When anything had to be re-read or
 * the journal is long, the reader writes a new snapshot and starts a new
 * journal. Deleting both loses nothing: the next read rebuilds them.
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

  /** Note a board's new version; call after its file is durably written (under its lock). */
  noteBoard(board: BoardFile, stamp: string): { journalBytes: number } {
    const line = `${toLogJson({ serial: board.serial, stamp, summary: summarizeBoard(board) })}\n`;
    appendFileSync(this.journal, line);
    return { journalBytes: statSync(this.journal).size };
  }

  async read(onProgress?: IndexProgress): Promise<LogIndex> {
    const snapshot = this.#readSnapshot();
    const boards: Record<string, BoardSummary> = snapshot?.boards ?? {};
    const stamps: Record<string, string> = snapshot?.stamps ?? {};
    const journalText = readText(this.journal) ?? '';
    for (const line of journalText.split('\n')) {
      if (line === '') continue;
      const entry = fromLogJson(line);
      // A torn last line (a crash mid-append) is skipped: the stamp check below repairs it.
      if (!entry.ok || typeof entry.data !== 'object' || entry.data === null) continue;
      const { serial, stamp, summary } = entry.data as { serial?: unknown; stamp?: unknown; summary?: unknown };
      if (typeof serial !== 'string' || typeof stamp !== 'string' || typeof summary !== 'object' || summary === null) continue;
      boards[serial] = summary as BoardSummary;
      stamps[serial] = stamp;
    }

    const onDisk = new Map<string, string>();
    for (const name of this.#boardNames()) {
      const serial = name.slice(0, -'.json'.length);
      const stamp = fileStamp(join(this.boardsDir, name));
      if (stamp !== null) onDisk.set(serial, stamp);
    }
    let changed = snapshot === null || journalText.length > journalLimitBytes;
    for (const serial of Object.keys(boards)) {
      if (!onDisk.has(serial)) {
        delete boards[serial];
        delete stamps[serial];
        changed = true;
      }
    }
    const stale = [...onDisk].filter(([serial, stamp]) => stamps[serial] !== stamp);
    const damaged: { serial: string; message: string }[] = [];
    let done = 0;
    if (stale.length > 0) onProgress?.(0, stale.length);
    for (const [serial, stamp] of stale) {
      try {
        const board = await this.readBoard(serial);
        if (board) {
          boards[serial] = summarizeBoard(board);
          stamps[serial] = stamp;
          changed = true;
        }
      } catch (error) {
        if (!(error instanceof LogDamageError)) throw error;
        damaged.push({ serial, message: error.message });
      }
      done++;
      if (onProgress && (done % 100 === 0 || done === stale.length)) onProgress(done, stale.length);
    }
    if (changed) await this.#compact({ schemaVersion: indexSchemaVersion, boards, stamps });
    return damaged.length > 0 ? { schemaVersion: indexSchemaVersion, boards, damaged } : { schemaVersion: indexSchemaVersion, boards };
  }

  #boardNames(): string[] {
    let names: string[];
    try {
      names = readdirSync(this.boardsDir);
    } catch (error) {
      if (errorCode(error) === 'ENOENT') return [];
      throw error;
    }
    for (const name of names) if (leftoverPattern.test(name)) this.#removeIfOld(join(this.boardsDir, name));
    return names.filter((name) => name.endsWith('.json') && validateSerial(name.slice(0, -5)) === null);
  }

  /** A temporary file of a writer that was killed mid-write; none lives longer than a write. */
  #removeIfOld(path: string): void {
    try {
      if (Date.now() - statSync(path).mtimeMs > leftoverAgeMs) unlinkSync(path);
    } catch (error) {
      if (errorCode(error) !== 'ENOENT') throw error;
    }
  }

  #readSnapshot(): Snapshot | null {
    const text = readText(this.file);
    if (text === null) return null;
    const parsed = fromLogJson(text);
    // The index is a cache of the board files: a damaged or foreign one is rebuilt, not refused.
    if (!parsed.ok) return null;
    const data = parsed.data as Partial<Snapshot> | null;
    if (!data || data.schemaVersion !== indexSchemaVersion || typeof data.boards !== 'object' || typeof data.stamps !== 'object') return null;
    return data as Snapshot;
  }

  async #compact(snapshot: Snapshot): Promise<void> {
    try {
      await withFileLock(this.file, async () => {
        // Lines appended after this move are lost from the journal; their boards'
        // stamps no longer match the snapshot, so the next read re-reads them.
        const aside = `${this.journal}.${process.pid}.old`;
        try {
          renameSync(this.journal, aside);
        } catch (error) {
          if (errorCode(error) !== 'ENOENT') throw error;
        }
        await new DurableTextFile(this.file).write(toLogJson(snapshot));
        try {
          unlinkSync(aside);
        } catch (error) {
          if (errorCode(error) !== 'ENOENT') throw error;
        }
      });
    } catch (error) {
      // A log opened read-only (a colleague's folder) still gets a correct index in memory.
      const code = errorCode(error);
      if (code === 'EACCES' || code === 'EROFS' || code === 'EPERM') return;
      throw error;
    }
  }
}
