import { computeTargets } from '../analysis/targets.js';
import { resolveCacheDir } from '../log/cache-dir.js';
import { TargetsCache } from '../log/targets-cache.js';
import type { CommandIo } from './command.js';
import { UsageError } from './errors.js';

export { cacheHelp } from './cache-help.js';

/** The `--cache` option's value, or a UsageError for an empty one. */
export function cacheFlag(value: string | boolean | undefined): string | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== 'string' || value.trim() === '')
    throw new UsageError('--cache needs a folder; leave it out to use $PROBEBOOK_CACHE or ~/.cache/probebook');
  return value;
}

/** The command's targets cache: the folder from `--cache` or the environment, problems said on stderr. */
export function targetsCacheFor(flag: string | boolean | undefined, io: Pick<CommandIo, 'env' | 'stderr'>): TargetsCache {
  return new TargetsCache({
    dir: resolveCacheDir(cacheFlag(flag), io.env),
    compute: computeTargets,
    onNotice: (message) => io.stderr(`probebook: warning: ${message}\n`),
  });
}
