import { existsSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { Samples } from '../analysis/sampling.js';
import { sampleChain } from '../analysis/sampling.js';
import { computeTargets, defaultSeed, defaultTrials, finishTargets, prepareTargets, type TargetOptions } from '../analysis/targets.js';
import type { TargetSet } from '../analysis/types.js';
import type { Plan } from '../plan/types.js';

/**
 * Below this many trials the Monte Carlo is not worth a thread: starting one
 * (its own copy of the modules, its own cold compiler) costs some 40 ms.
 */
export const parallelFrom = 2000;

/**
 * A second thread only shortens the run when a core is free for it: on a busy
 * machine (the last minute's load average within a core of the core count) it
 * only adds its start and competes with this thread. Measured on a 2-core
 * machine under a load of about 9: 2.4 s with the worker against 1.9 s without.
 */
function hasFreeCore(): boolean {
  const cores = availableParallelism();
  return cores >= 2 && (loadavg()[0] ?? 0) < cores - 1;
}

/**
 * `auto`: a worker when the run is large enough, a core is free and the bundled
 * worker is there (under tsx a worker compiles every source again, which costs
 * more than it saves); `always`: a worker whenever one can start; `one`: never.
 */
export type Threads = 'auto' | 'always' | 'one';

/** `PROBEBOOK_THREADS`: `1` keeps `targets` on one thread, `2` always takes the worker, anything else decides by itself. */
export function threadsFromEnv(value: string | undefined): Threads {
  return value === '1' ? 'one' : value === '2' ? 'always' : 'auto';
}

function hasBundledWorker(): boolean {
  return workerScript()?.isEval === false;
}

/** The samples worker beside this module: `samples-worker.js` next to the bundle, or the TypeScript source under tsx. */
function workerScript(): { script: URL | string; isEval: boolean } | null {
  const js = new URL('./samples-worker.js', import.meta.url);
  if (existsSync(fileURLToPath(js))) return { script: js, isEval: false };
  const ts = new URL('./samples-worker.ts', import.meta.url);
  if (!existsSync(fileURLToPath(ts))) return null;
  // Under tsx (development, tests) the worker registers tsx itself: Node 20 does not pass `--import` hooks on to workers.
  const code = `import('tsx/esm/api').then((api) => { api.register(); return import(${JSON.stringify(ts.href)}); }).catch((e) => { require('node:worker_threads').parentPort.postMessage({ type: 'error', message: 'the samples worker did not start: ' + String((e && e.message) || e) }); });`;
  return { script: code, isEval: true };
}

interface WorkerAnswer {
  readonly type: 'progress' | 'samples' | 'error';
  readonly done?: number;
  readonly total?: number;
  readonly values?: Float64Array[];
  readonly missing?: Int32Array;
  readonly trials?: number;
  readonly message?: string;
}

/** What the worker gave: its samples, or why there are none (then the caller samples itself). */
export type OffThread = { readonly samples: Samples } | { readonly samples: null; readonly why: string };

/** The Monte Carlo in a worker thread; null when there is no worker script to start. */
export function samplesOffThread(plan: Plan, trials: number, seed: number, options: TargetOptions): Promise<OffThread> | null {
  const start = workerScript();
  if (!start) return null;
  return new Promise((resolve) => {
    let settled = false;
    const worker = new Worker(start.script, {
      eval: start.isEval,
      workerData: {
        text: plan.text,
        file: plan.file,
        trials,
        seed,
        distribution: options.distribution ?? 'normal',
        progress: options.onProgress !== undefined,
      },
    });
    const finish = (answer: OffThread): void => {
      if (settled) return;
      settled = true;
      resolve(answer);
      void worker.terminate();
    };
    worker.on('message', (m: WorkerAnswer) => {
      if (m.type === 'progress' && m.done !== undefined && m.total !== undefined) options.onProgress?.(m.done, m.total);
      else if (m.type === 'samples' && m.values && m.missing && m.trials !== undefined)
        finish({ samples: { values: m.values, missing: m.missing, trials: m.trials } });
      else if (m.type === 'error') finish({ samples: null, why: m.message ?? 'it failed' });
    });
    worker.on('error', (error) => finish({ samples: null, why: error.message }));
    worker.on('exit', (code) => finish({ samples: null, why: `it stopped (exit ${code})` }));
  });
}

/**
 * `computeTargets` on two threads: the Monte Carlo in a worker while this
 * thread computes the sensitivities and searches the worst case, then the bands
 * from both. The numbers are those of `computeTargets` (the same seeded samples
 * of the same chain); should the worker fail to start or stop, this thread draws
 * the samples itself (said through `onNotice` when the worker was asked for). Small runs stay on one thread (`parallelFrom`), and so does
 * any run on a busy machine (`hasFreeCore`) or from the sources, unless `when` says otherwise.
 */
export async function computeTargetsInParallel(
  plan: Plan,
  options: TargetOptions = {},
  when: Threads = 'auto',
  onNotice?: (message: string) => void,
): Promise<TargetSet> {
  const trials = options.trials ?? defaultTrials;
  const seed = options.seed ?? defaultSeed;
  if (!Number.isSafeInteger(trials) || when === 'one' || (when === 'auto' && (trials < parallelFrom || !hasFreeCore() || !hasBundledWorker())))
    return computeTargets(plan, options);
  const offThread = samplesOffThread(plan, trials, seed, options);
  if (!offThread) {
    if (when === 'always') onNotice?.('no samples worker beside the command; the Monte Carlo ran on one thread');
    return computeTargets(plan, options);
  }
  const prepared = prepareTargets(plan);
  const answer = await offThread;
  // Asked for explicitly, a worker that did not deliver is said (the numbers are the same either way).
  if (!answer.samples && when === 'always') onNotice?.(`the samples worker did not deliver (${answer.why}); the Monte Carlo ran on one thread`);
  const samples =
    answer.samples ??
    sampleChain(prepared.chain, {
      trials,
      seed,
      distribution: options.distribution ?? 'normal',
      ...(options.onProgress ? { onProgress: options.onProgress } : {}),
    });
  return finishTargets(prepared, samples);
}
