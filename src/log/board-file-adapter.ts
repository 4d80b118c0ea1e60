import type { Adapter } from 'lowdb';
import { checkBoardShape } from './board-schema.js';
import { DurableTextFile } from './durable-text-file.js';
import { LogDamageError } from './errors.js';
import { readTextIfAny } from './read-text.js';
import { fromLogJson, toLogJson } from './json-text.js';
import { type Migration, boardMigrations, migrateBoard } from './migrate.js';
import { type BoardFile, boardSchemaVersion } from './types.js';

/** The first problem that keeps a board file's text from being read, or null when it reads. */
function problemOf(
  text: string,
  serial: string,
  migrations: Readonly<Record<number, Migration>>,
): { problem: string; isNewer: boolean } | { board: BoardFile } {
  const parsed = fromLogJson(text);
  if (!parsed.ok) return { problem: parsed.problem, isNewer: false };
  const data = parsed.data;
  if (typeof data !== 'object' || data === null || Array.isArray(data)) return { problem: 'it holds no JSON object', isNewer: false };
  const migrated = migrateBoard(data as Record<string, unknown>, migrations);
  if (!migrated.ok) {
    if (migrated.kind === 'newer') {
      return {
        problem: `it was written by a newer probebook (schema version ${String(migrated.version)}; this one reads up to ${boardSchemaVersion})`,
        isNewer: true,
      };
    }
    return { problem: `schemaVersion: ${JSON.stringify(migrated.version) ?? 'missing'} is not a known board schema version`, isNewer: false };
  }
  const shape = checkBoardShape(migrated.data);
  if (!shape.ok) return { problem: `wrong shape at ${shape.problem}`, isNewer: false };
  if (shape.board.serial !== serial) {
    // A case-blind file system maps "sn-1" and "SN-1" to one file: never mix two boards.
    return {
      problem: `it holds board ${JSON.stringify(shape.board.serial)}, not ${JSON.stringify(serial)} (serials that differ only in case share a file on this file system)`,
      isNewer: false,
    };
  }
  return { board: shape.board };
}

function remedy(file: string, serial: string, isNewer: boolean, migrations: Readonly<Record<number, Migration>>): string {
  if (isNewer) return 'Open this log with the newer probebook that wrote it (update probebook).';
  const backup = `${file}.bak`;
  const bak = readTextIfAny(backup);
  if (bak !== null && 'board' in problemOf(bak, serial, migrations)) {
    return `The previous good version is ${backup}; restore it with: cp '${backup}' '${file}.restore' && mv '${file}.restore' '${file}' (it lacks at most the last change; check it with probebook history).`;
  }
  return `No good backup (${backup} is ${bak === null ? 'missing' : 'damaged too'}): fix the file by hand at that place, or move it aside with: mv '${file}' '${file}.damaged'`;
}

/**
 * Read and check a board file now (the index needs this inside a getter): null
 * when there is none, a LogDamageError when it cannot be read as it stands.
 */
export function readBoardFileSync(file: string, serial: string, migrations: Readonly<Record<number, Migration>> = boardMigrations): BoardFile | null {
  const text = readTextIfAny(file);
  if (text === null) return null;
  const result = problemOf(text, serial, migrations);
  if ('board' in result) return result.board;
  throw new LogDamageError(
    file,
    `board file ${file} cannot be read: ${result.problem}; it was left untouched. ${remedy(file, serial, result.isNewer, migrations)}`,
  );
}

/**
 * A board file (`boards/<serial>.json`) as a lowdb adapter, stacked on the
 * durable text file: JSON with ±Infinity readings, a shape check on every read,
 * older schema versions migrated, and newer or damaged files refused with one
 * line that names the file, the place and the remedy. Nothing here ever writes
 * over a file that did not read.
 */
export class BoardFileAdapter implements Adapter<BoardFile> {
  readonly text: DurableTextFile;

  constructor(
    readonly file: string,
    readonly serial: string,
    readonly migrations: Readonly<Record<number, Migration>> = boardMigrations,
  ) {
    this.text = new DurableTextFile(file, { keepBackup: true });
  }

  async read(): Promise<BoardFile | null> {
    return readBoardFileSync(this.file, this.serial, this.migrations);
  }

  async write(board: BoardFile): Promise<void> {
    if (board.schemaVersion !== boardSchemaVersion) throw new Error(`refusing to write board ${board.serial} with schema version ${board.schemaVersion}`);
    await this.text.write(`${toLogJson(board, 1)}\n`);
  }
}
