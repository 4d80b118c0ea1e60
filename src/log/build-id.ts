import { createHash, randomBytes } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

// Replaced by the build script with the same hash of src/ and data/ made at build time.
declare const __PROBEBOOK_BUILD__: string | undefined;

/**
 * A hash of every file under `dirs` (relative path and content, in name order),
 * 16 hex digits. `scripts/build.mjs` computes the same for the bundle.
 */
export function hashTree(root: string, dirs: readonly string[]): string {
  const hash = createHash('sha256');
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const path = join(dir, entry.name);
      if (entry.isDirectory()) walk(path);
      else if (entry.isFile()) {
        hash.update(relative(root, path).split('\\').join('/'));
        hash.update(readFileSync(path));
      }
    }
  };
  for (const dir of dirs) walk(join(root, dir));
  return hash.digest('hex').slice(0, 16);
}

let fromSources: string | undefined;

/**
 * The id of the models that compute targets: the bundle's, stamped at build
 * time; run from source (tsx, the tests), a hash of `src/` and `data/` made once
 * per process. A changed model therefore never reuses targets an older one
 * computed, and nobody bumps a constant by hand. Bundled by someone else's
 * build (no stamp, no sources beside it), the id is a hash of the running file
 * itself, and failing that one of its own per process, so the cache is never
 * trusted across code it cannot identify.
 */
export function buildId(): string {
  if (typeof __PROBEBOOK_BUILD__ === 'string') return __PROBEBOOK_BUILD__;
  if (fromSources === undefined) fromSources = unstampedId(fileURLToPath(import.meta.url));
  return fromSources;
}

/** The id without a build stamp: the sources' hash, else the running file's, else a fresh one. */
export function unstampedId(self: string): string {
  // This file is src/log/build-id.ts: the repository is two folders up.
  const root = join(dirname(self), '..', '..');
  try {
    if (statSync(join(root, 'src', 'log', 'build-id.ts')).isFile()) return `src-${hashTree(root, ['src', 'data'])}`;
  } catch {
    // Not run from a checkout: try the file itself.
  }
  try {
    return `file-${createHash('sha256').update(readFileSync(self)).digest('hex').slice(0, 16)}`;
  } catch {
    return `process-${randomBytes(8).toString('hex')}`;
  }
}
