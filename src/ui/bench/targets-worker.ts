// Computes a plan's targets off the UI thread, so the bench screen keeps drawing
// (and shows progress) while the Monte Carlo runs. Started by `targets-off-thread.ts`.
import { parentPort, workerData } from 'node:worker_threads';
import { computeTargets } from '../../analysis/targets.js';
import { loadPlanText } from '../../plan/load.js';

interface Job {
  readonly text: string;
  readonly file: string;
  readonly trials: number;
  readonly seed: number;
}

const job = workerData as Job;
try {
  const plan = loadPlanText(job.text, job.file);
  const set = computeTargets(plan, {
    trials: job.trials,
    seed: job.seed,
    onProgress: (done, total) => parentPort?.postMessage({ type: 'progress', done, total }),
  });
  parentPort?.postMessage({ type: 'done', set });
} catch (error) {
  parentPort?.postMessage({ type: 'error', message: error instanceof Error ? error.message : String(error) });
}
