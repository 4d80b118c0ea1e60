import { computeTargets } from '../../analysis/targets.js';
import type { BenchLog } from '../../log/types.js';
import { loadPlanText } from '../../plan/load.js';
import { createBandSource, type BandSource } from '../../review/bands.js';

/**
 * The bands of a log's plan snapshots, through the real plan loader and target
 * engine. Kept out of `src/review` so the review core stays pure; the shell
 * commands and both review screens share this one wiring.
 */
export function planBandSource(log: Pick<BenchLog, 'readPlanSnapshot'>): BandSource {
  return createBandSource({
    readSnapshot: (hash) => log.readPlanSnapshot(hash),
    targetsOf: (text, hash) => computeTargets(loadPlanText(text, `plan snapshot ${hash.slice(0, 12)}`)),
  });
}
