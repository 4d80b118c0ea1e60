import { randomBytes } from 'node:crypto';
import { closeSync, copyFileSync, fsyncSync, linkSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname } from 'node:path';
import type { Adapter } from 'lowdb';
import { errorCode } from './errors.js';
import { readTextIfAny } from './read-text.js';

export interface DurableTextOptions {
  /** Keep the version being replaced as `<file>.bak`. @default false */
  readonly keepBackup?: boolean;
}

/** Flush a folder's entries (the rename) to disk. */
export function syncDir(dir: string): void {
  let fd: number;
  try {
    fd = openSync(dir, 'r');
  } catch (error) {
    // Windows cannot open a folder for flushing; its renames are journalled anyway.
    if (process.platform === 'win32') return;
    throw error;
  }
  try {
    fsyncSync(fd);
  } catch (error) {
    if (!(process.platform === 'win32' || errorCode(error) === 'EINVAL')) throw error;
  } finally {
    closeSync(fd);
  }
}

/** Write `bytes` to `path` and flush them to disk before returning. */
export function writeFlushed(path: string, bytes: string | Uint8Array, flag = 'wx'): void {
  const fd = openSync(path, flag);
  try {
    const data = typeof bytes === 'string' ? Buffer.from(bytes, 'utf8') : bytes;
    let done = 0;
    while (done < data.length) done += writeSync(fd, data, done, data.length - done);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

function tempName(file: string, tag: string): string {
  return `${file}.${process.pid}-${randomBytes(4).toString('hex')}.${tag}`;
}

/**
 * A text file that is replaced atomically and durably (the lowdb TextFile layer,
 * made crash-safe): the new text goes to a temporary file in the same folder,
 * is flushed (fsync), renamed over the old one, and the folder is flushed. Only
 * then does `write` resolve, so a caller may tell the user "saved". A crash at
 * any moment leaves either the old or the new file, whole.
 *
 * With `keepBackup`, the replaced version stays as `<file>.bak`: it is hard-linked
 * there before the rename (no copy, and the swap of the backup is atomic too),
 * falling back to a flushed copy where links are not allowed.
 *
 * A missing file reads as null; every other I/O error is thrown.
 */
export class DurableTextFile implements Adapter<string> {
  readonly backup: string;
  readonly #keepBackup: boolean;

  constructor(
    readonly file: string,
    options: DurableTextOptions = {},
  ) {
    this.backup = `${file}.bak`;
    this.#keepBackup = options.keepBackup ?? false;
  }

  async read(): Promise<string | null> {
    return readTextIfAny(this.file);
  }

  async write(text: string | Uint8Array): Promise<void> {
    const tmp = tempName(this.file, 'tmp');
    try {
      writeFlushed(tmp, text);
      if (this.#keepBackup) this.#keepOldVersion();
      renameSync(tmp, this.file);
    } catch (error) {
      try {
        unlinkSync(tmp);
      } catch {
        // The temporary file may never have been created; the first error is the one to report.
      }
      throw error;
    }
    syncDir(dirname(this.file));
  }

  #keepOldVersion(): void {
    const aside = tempName(this.file, 'baktmp');
    try {
      linkSync(this.file, aside);
    } catch (error) {
      const code = errorCode(error);
      if (code === 'ENOENT') return; // first version: nothing to keep
      if (code !== 'EPERM' && code !== 'EXDEV' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP' && code !== 'EMLINK') throw error;
      // No hard links here (some network and FAT file systems): a flushed copy.
      try {
        copyFileSync(this.file, aside);
      } catch (copyError) {
        if (errorCode(copyError) === 'ENOENT') return;
        throw copyError;
      }
      const fd = openSync(aside, 'r+');
      try {
        fsyncSync(fd);
      } finally {
        closeSync(fd);
      }
    }
    renameSync(aside, this.backup);
  }

  toString(): string {
    return basename(this.file);
  }
}
