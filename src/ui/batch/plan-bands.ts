import { computeTargets, defaultSeed, defaultTrials } from '../../analysis/targets.js';
import type { BenchLog } from '../../log/types.js';
import { TargetsCache } from '../../log/targets-cache.js';
import { createBandSource, type BandSource } from '../../review/bands.js';

/** A cache that keeps targets in memory only (tests, screens opened without a cache folder). */
export function memoryTargetsCache(): TargetsCache {
  return new TargetsCache({ dir: null, compute: computeTargets });
}

/**
 * The bands of a log's plan snapshots, through the plan loader, the target
 * engine and the one targets cache of the store layer (`src/log/targets-cache.ts`):
 * a snapshot's targets depend only on its exact text and the engine's fixed
 * trials and seed, so a large plan's Monte Carlo runs once.
 */
export function planBandSource(
  log: Pick<BenchLog, 'readPlanSnapshot'>,
  cache: TargetsCache,
  onProgress?: (hash: string, done: number, total: number) => void,
): BandSource {
  return createBandSource({
    readSnapshot: (hash) => log.readPlanSnapshot(hash),
    targetsOf: (text, hash) =>
      cache.forText(text, hash, `plan snapshot ${hash.slice(0, 12)}`, {
        trials: defaultTrials,
        seed: defaultSeed,
        ...(onProgress ? { onProgress: (done: number, total: number) => onProgress(hash, done, total) } : {}),
      }),
  });
}
