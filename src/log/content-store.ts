import { createHash } from 'node:crypto';
import { mkdirSync, renameSync, statSync, unlinkSync } from 'node:fs';
import { extname, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { syncDir, writeFlushed } from './durable-text-file.js';
import { errorCode, LogInputError } from './errors.js';
import { readTextIfAny } from './read-text.js';

export function sha256Hex(bytes: string | Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

const hashPattern = /^[0-9a-f]{64}$/;

/** The extension kept on a capture file: lower-case letters and digits, else `bin`. */
export function captureExtension(name: string): string {
  const ext = extname(name).slice(1).toLowerCase();
  return /^[a-z0-9]{1,8}$/.test(ext) ? ext : 'bin';
}

/**
 * Files kept by content (`plans/<sha256>.json`, `captures/<sha256>.<ext>`): written
 * once, durably, never changed; a file already there with the same hash is the
 * same content and is left alone.
 */
export class ContentStore {
  constructor(readonly dir: string) {}

  /** Save `bytes` as `<hash>.<ext>` unless present; returns the file name. */
  put(bytes: string | Uint8Array, ext: string, hash: string = sha256Hex(bytes)): string {
    const name = `${hash}.${ext}`;
    const path = join(this.dir, name);
    const size = typeof bytes === 'string' ? Buffer.byteLength(bytes, 'utf8') : bytes.length;
    try {
      if (statSync(path).size === size) return name;
      // Same name, other size: a half-copied file from before this writer; replace it.
    } catch (error) {
      if (errorCode(error) !== 'ENOENT') throw error;
    }
    mkdirSync(this.dir, { recursive: true });
    const tmp = `${path}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`;
    try {
      writeFlushed(tmp, bytes);
      renameSync(tmp, path);
    } catch (error) {
      try {
        unlinkSync(tmp);
      } catch {
        // never created
      }
      throw error;
    }
    syncDir(this.dir);
    return name;
  }

  /** The text of `<hash>.<ext>`, or null when it is not kept. */
  getText(hash: string, ext: string): string | null {
    if (!hashPattern.test(hash)) throw new LogInputError(`${JSON.stringify(hash)} is not a sha256 in hex`);
    return readTextIfAny(join(this.dir, `${hash}.${ext}`));
  }

  has(hash: string, ext: string): boolean {
    try {
      statSync(join(this.dir, `${hash}.${ext}`));
      return true;
    } catch (error) {
      if (errorCode(error) === 'ENOENT') return false;
      throw error;
    }
  }
}
