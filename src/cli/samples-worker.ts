// The Monte Carlo of a plan in a worker thread, while the command's own thread
// searches the worst case (targets-parallel.ts). Same plan text, same chain,
// same seed: the same samples as on the command's thread.
import { parentPort, workerData } from 'node:worker_threads';
import type { Distribution } from '../analysis/random.js';
import { sampleChain } from '../analysis/sampling.js';
import { buildChain } from '../plan/chain.js';
import { loadPlanText } from '../plan/load.js';

interface Job {
  readonly text: string;
  readonly file: string;
  readonly trials: number;
  readonly seed: number;
  readonly distribution: Distribution;
  readonly progress: boolean;
}

const job = workerData as Job;
try {
  const chain = buildChain(loadPlanText(job.text, job.file));
  const samples = sampleChain(chain, {
    trials: job.trials,
    seed: job.seed,
    distribution: job.distribution,
    ...(job.progress ? { onProgress: (done: number, total: number) => parentPort?.postMessage({ type: 'progress', done, total }) } : {}),
  });
  // The arrays move to the command's thread without a copy.
  parentPort?.postMessage(
    { type: 'samples', values: samples.values, missing: samples.missing, trials: samples.trials },
    samples.values.map((v) => v.buffer as ArrayBuffer),
  );
} catch (error) {
  parentPort?.postMessage({ type: 'error', message: error instanceof Error ? error.message : String(error) });
}
