import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { homedir } from 'node:os';
import { join } from 'node:path';
import { computeTargets, defaultSeed, defaultTrials } from '../../analysis/targets.js';
import type { BenchLog } from '../../log/types.js';
import { loadPlanText } from '../../plan/load.js';
import { createBandSource, type BandSource, type TargetList } from '../../review/bands.js';
import { bandsFromText, bandsToText } from './bands-cache-text.js';

// Replaced by the build script with a hash of src/ and data/ (scripts/build.mjs).
declare const __PROBEBOOK_BUILD__: string | undefined;
const build = typeof __PROBEBOOK_BUILD__ === 'string' ? __PROBEBOOK_BUILD__ : 'source';

/**
 * The cache key of computed bands: the engine's trials and seed and the build
 * (a hash of the sources), so a changed model never reuses bands of an older one.
 * Run from source (tsx, tests) the build is `source`: bump the `e` number by hand there
 * when the cache text changes (e2: the limit-check mark).
 */
export const targetsEngineKey = `e2-${build}-t${defaultTrials}-s${defaultSeed}`;

/**
 * Where computed targets are cached between runs: `$PROBEBOOK_CACHE`, else the
 * XDG Base Directory cache folder (`$XDG_CACHE_HOME/probebook`, default
 * `~/.cache/probebook`). Everything there can be deleted at any time.
 */
export function resolveCacheDir(env: NodeJS.ProcessEnv = process.env): string {
  if (env.PROBEBOOK_CACHE) return env.PROBEBOOK_CACHE;
  const base = env.XDG_CACHE_HOME && env.XDG_CACHE_HOME !== '' ? env.XDG_CACHE_HOME : join(homedir(), '.cache');
  return join(base, 'probebook');
}

export interface PlanBandOptions {
  /** Cache folder; null keeps targets in memory only. @default resolveCacheDir(process.env) */
  readonly cacheDir?: string | null;
  /** Hears about a long target computation (the Monte Carlo), per snapshot. */
  readonly onProgress?: (hash: string, done: number, total: number) => void;
}

// One process computes a snapshot's targets once for every screen and command.
const computed = new Map<string, TargetList>();
const warnings: string[] = [];

function cached(file: string): TargetList | null {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') warnings.push(`targets cache ${file} unreadable, recomputed: ${(error as Error).message}`);
    return null;
  }
  return bandsFromText(text);
}

function save(dir: string, file: string, set: TargetList): void {
  try {
    mkdirSync(dir, { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    writeFileSync(tmp, bandsToText(set));
    // Rename so a reader never sees half a file.
    renameSync(tmp, file);
  } catch (error) {
    warnings.push(`targets cache not saved in ${dir}: ${(error as Error).message}`);
  }
}

/**
 * The bands of a log's plan snapshots, through the real plan loader and target
 * engine. Targets depend only on the snapshot's exact text (its hash) and the
 * engine's fixed trials and seed, and the Monte Carlo of a large plan takes
 * seconds, so they are computed once and cached on disk by hash. Kept out of
 * `src/review` so the review core stays pure.
 */
export function planBandSource(log: Pick<BenchLog, 'readPlanSnapshot'>, options: PlanBandOptions = {}): BandSource {
  const dir = options.cacheDir === undefined ? resolveCacheDir() : options.cacheDir;
  return createBandSource({
    readSnapshot: (hash) => log.readPlanSnapshot(hash),
    targetsOf: (text, hash) => {
      const key = `${targetsEngineKey}-${hash}`;
      const file = dir ? join(dir, `targets-${key}.json`) : null;
      let set = computed.get(key) ?? (file ? cached(file) : null);
      if (!set) {
        const progress = options.onProgress;
        set = computeTargets(loadPlanText(text, `plan snapshot ${hash.slice(0, 12)}`), progress ? { onProgress: (done, total) => progress(hash, done, total) } : {});
        if (dir && file) save(dir, file, set);
      }
      computed.set(key, set);
      return set;
    },
  });
}

/** Cache problems seen so far (shown as warnings, never fatal). */
export function bandCacheWarnings(): readonly string[] {
  return warnings;
}
