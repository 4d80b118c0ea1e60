import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { TargetSet } from '../../analysis/types.js';
import type { Plan } from '../../plan/types.js';

export type Progress = (done: number, total: number) => void;

/**
 * The worker script beside this module: `targets-worker.js` next to the bundle
 * (scripts/build.mjs writes it to dist/), or the TypeScript source under tsx.
 */
function workerScript(): { script: URL | string; isEval: boolean } | null {
  const js = new URL('./targets-worker.js', import.meta.url);
  if (existsSync(fileURLToPath(js))) return { script: js, isEval: false };
  const ts = new URL('./targets-worker.ts', import.meta.url);
  if (!existsSync(fileURLToPath(ts))) return null;
  // Under tsx (development, tests) the worker registers tsx itself: Node 20 does
  // not pass `--import` hooks on to worker threads.
  const code = `import('tsx/esm/api').then((api) => { api.register(); return import(${JSON.stringify(ts.href)}); }).catch((e) => { require('node:worker_threads').parentPort.postMessage({ type: 'error', message: 'the targets worker did not start: ' + String((e && e.message) || e) }); });`;
  return { script: code, isEval: true };
}

/**
 * Compute targets in a worker thread; null when no worker can start (then the
 * caller computes on its own thread). The seeded Monte Carlo gives the same
 * numbers either way.
 */
export function targetsOffThread(plan: Plan, trials: number, seed: number, onProgress?: Progress): Promise<TargetSet> | null {
  const start = workerScript();
  if (!start) return null;
  return new Promise((resolve, reject) => {
    const worker = new Worker(start.script, { eval: start.isEval, workerData: { text: plan.text, file: plan.file, trials, seed } });
    let settled = false;
    const finish = (action: () => void) => {
      if (settled) return;
      settled = true;
      action();
      void worker.terminate();
    };
    worker.on('message', (m: { type: string; done?: number; total?: number; set?: TargetSet; message?: string }) => {
      if (m.type === 'progress' && m.done !== undefined && m.total !== undefined) onProgress?.(m.done, m.total);
      else if (m.type === 'done' && m.set) finish(() => resolve(m.set as TargetSet));
      else if (m.type === 'error') finish(() => reject(new Error(m.message ?? 'the targets could not be computed')));
    });
    worker.on('error', (error) => finish(() => reject(error)));
    worker.on('exit', (code) => finish(() => reject(new Error(`the targets worker stopped (exit ${code})`))));
    // The worker alone never keeps the process alive: quitting the app while it computes
    // ends at once (its result was only going to the cache). After the listeners: adding
    // a 'message' listener refs the worker again (Node 20, tried).
    worker.unref();
  });
}
