import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { TargetSet } from '../../analysis/types.js';

/** A statistical pass running in a worker; `cancel` stops it (a newer draft made it stale). */
export interface RefineJob {
  readonly done: Promise<TargetSet>;
  readonly cancel: () => void;
}

/**
 * The bench's targets worker (`dist/targets-worker.js` beside the bundle, or
 * its TypeScript source under tsx), started for one plan text. Unlike the
 * bench's one-shot helper, the editor must be able to stop a pass that a new
 * keystroke made stale, on a small machine where a stale Monte Carlo would
 * only slow the next one.
 */
export function refineOffThread(text: string, file: string, trials: number, seed: number, onProgress: (done: number, total: number) => void): RefineJob | null {
  const js = new URL('./targets-worker.js', import.meta.url);
  const ts = new URL('../bench/targets-worker.ts', import.meta.url);
  let worker: Worker;
  if (existsSync(fileURLToPath(js))) worker = new Worker(js, { workerData: { text, file, trials, seed } });
  else if (existsSync(fileURLToPath(ts))) {
    // Under tsx (development, tests) the worker registers tsx itself: Node 20 does not pass `--import` hooks on.
    // tsx is found from here, not from the working folder (the editor may run anywhere).
    const local = new URL('../../../node_modules/tsx/dist/esm/api/index.mjs', import.meta.url);
    const api = existsSync(fileURLToPath(local)) ? local.href : 'tsx/esm/api';
    const code = `import(${JSON.stringify(api)}).then((api) => { api.register(); return import(${JSON.stringify(ts.href)}); }).catch((e) => { require('node:worker_threads').parentPort.postMessage({ type: 'error', message: String((e && e.message) || e) }); });`;
    worker = new Worker(code, { eval: true, workerData: { text, file, trials, seed } });
  } else return null;
  let settle: ((action: () => void) => void) | undefined;
  const done = new Promise<TargetSet>((resolve, reject) => {
    let isSettled = false;
    settle = (action) => {
      if (isSettled) return;
      isSettled = true;
      action();
      void worker.terminate();
    };
    const finish = settle;
    worker.on('message', (m: { type: string; done?: number; total?: number; set?: TargetSet; message?: string }) => {
      if (m.type === 'progress' && m.done !== undefined && m.total !== undefined) onProgress(m.done, m.total);
      else if (m.type === 'done' && m.set) finish(() => resolve(m.set as TargetSet));
      else if (m.type === 'error') finish(() => reject(new Error(m.message ?? 'the targets could not be computed')));
    });
    worker.on('error', (error) => finish(() => reject(error)));
    worker.on('exit', (code) => finish(() => reject(new Error(`the targets worker stopped (exit ${code})`))));
  });
  return { done, cancel: () => settle?.(() => undefined) };
}
