import { mkdirSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { errorCode, ioFailure, LogIoError } from './errors.js';

/**
 * Make a log folder and any missing parents, one level at a time. Node's own
 * recursive `mkdir` loops forever where a parent can neither be found nor made
 * (a path under `/proc`), so the walk here is bounded by the path's depth and
 * every failure is one line naming the place and the remedy.
 */
export function ensureFolder(path: string): void {
  const target = resolve(path);
  const missing: string[] = [];
  for (let dir = target; ; dir = dirname(dir)) {
    let isDir: boolean | null;
    try {
      isDir = statSync(dir).isDirectory();
    } catch (error) {
      const code = errorCode(error);
      if (code === 'ENOTDIR')
        throw new LogIoError(`log folder ${target} cannot be made: a file stands where a folder should be on that path; pass another --log DIR`, code);
      if (code !== 'ENOENT') throw ioFailure(error, `log folder ${target} cannot be used`, dir);
      isDir = null;
    }
    if (isDir === false) {
      throw new LogIoError(`log folder ${target} cannot be made: ${dir} is a file, not a folder; pass another --log DIR`, 'ENOTDIR');
    }
    if (isDir === true) break;
    missing.push(dir);
    if (dirname(dir) === dir) break;
  }
  for (const dir of missing.reverse()) {
    try {
      mkdirSync(dir);
    } catch (error) {
      const code = errorCode(error);
      // Made by another process in the meantime: fine, as long as it is a folder.
      if (code === 'EEXIST' && statSync(dir).isDirectory()) continue;
      if (code === 'ENOENT') throw new LogIoError(`log folder ${target} cannot be made: ${dirname(dir)} takes no new folders; pass another --log DIR`, code);
      throw ioFailure(error, `log folder ${target} cannot be made`, dir);
    }
  }
}
