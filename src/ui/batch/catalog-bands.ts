import type { BenchLog } from '../../log/types.js';
import { createBandSource, type BandSource } from '../../review/bands.js';
import type { PlanCatalog } from '../bench/plan-catalog.js';

/** Progress of one plan revision's targets: its plan id, trials done of total. */
export type TargetsProgress = (plan: string, done: number, total: number) => void;

/** Later than Ink's 30 fps render throttle, so a progress line is drawn before any work that may hold this thread. */
const drawFirst = () => new Promise((resolve) => setTimeout(resolve, 60));

/**
 * The bands of a log's plan snapshots as the bring-up screen gets its targets:
 * through the app's plan catalog, so from the one targets cache when they are
 * there, else computed in the targets worker (`targets-off-thread.ts`) while
 * the screen keeps answering keys, with progress. A snapshot that cannot be
 * loaded or computed becomes one of the band source's problems (one line),
 * and the figures are made without its bands.
 */
export function catalogBandSource(log: Pick<BenchLog, 'readPlanSnapshot'>, catalog: PlanCatalog, onProgress: TargetsProgress): BandSource {
  return createBandSource({
    readSnapshot: (hash) => log.readPlanSnapshot(hash),
    // The band source has read the snapshot already: the catalog loads that text rather than reading it again.
    targetsOf: async (text, hash) => {
      const plan = catalog.fromSnapshot(hash, text);
      if (!plan) throw new Error(catalog.broken.get(hash) ?? 'the log no longer holds it');
      if (catalog.hasTargets(plan)) return catalog.targets(plan);
      onProgress(plan.plan, 0, 1);
      await drawFirst();
      return catalog.targetsAsync(plan, (done, total) => onProgress(plan.plan, done, total));
    },
  });
}
