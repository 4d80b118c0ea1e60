import { computeTargets } from '../../analysis/targets.js';
import type { BenchLog } from '../../log/types.js';
import { loadPlanText } from '../../plan/load.js';
import { createBandSource, type BandSource, type TargetList } from '../../review/bands.js';

// Targets of a snapshot depend only on its exact text (the hash) and the
// engine's fixed seed and trials, so one process computes them once for every
// screen and command that asks (the Monte Carlo takes a good part of a second).
const computed = new Map<string, TargetList>();

function targetsOf(text: string, hash: string): TargetList {
  let set = computed.get(hash);
  if (!set) {
    set = computeTargets(loadPlanText(text, `plan snapshot ${hash.slice(0, 12)}`));
    computed.set(hash, set);
  }
  return set;
}

/**
 * The bands of a log's plan snapshots, through the real plan loader and target
 * engine. Kept out of `src/review` so the review core stays pure; the shell
 * commands and both review screens share this one wiring.
 */
export function planBandSource(log: Pick<BenchLog, 'readPlanSnapshot'>): BandSource {
  return createBandSource({ readSnapshot: (hash) => log.readPlanSnapshot(hash), targetsOf });
}
