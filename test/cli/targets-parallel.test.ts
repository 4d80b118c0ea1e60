import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { sampleChain } from '../../src/analysis/sampling.js';
import { computeTargets } from '../../src/analysis/targets.js';
import { main } from '../../src/cli/main.js';
import { computeTargetsInParallel, samplesOffThread, threadsFromEnv } from '../../src/cli/targets-parallel.js';
import { buildChain } from '../../src/plan/chain.js';
import { loadPlanFile } from '../../src/plan/load.js';

describe('targets on two threads (the Monte Carlo in a worker beside the worst-case search)', () => {
  test('the worker draws the very samples this thread draws (same plan text, same seed)', async () => {
    const plan = await loadPlanFile('demo/exciter.plan.json');
    const job = samplesOffThread(plan, 3000, 7, { distribution: 'normal' });
    expect(job).not.toBeNull();
    const answer = await job;
    const off = answer?.samples;
    expect(off).toBeTruthy();
    const here = sampleChain(buildChain(plan), { trials: 3000, seed: 7, distribution: 'normal' });
    expect(off?.trials).toBe(3000);
    expect(off?.values.length).toBe(here.values.length);
    for (const [i, v] of here.values.entries()) expect(Array.from(off?.values[i] ?? [])).toEqual(Array.from(v));
    expect(Array.from(off?.missing ?? [])).toEqual(Array.from(here.missing));
  }, 60_000);

  test('the bands and warnings equal those of computeTargets on one thread, progress forwarded', async () => {
    const plan = await loadPlanFile('demo/exciter.plan.json');
    const progress: number[] = [];
    const notices: string[] = [];
    const two = await computeTargetsInParallel(plan, { trials: 4000, seed: 3, onProgress: (done) => progress.push(done) }, 'always', (m) => notices.push(m));
    // The worker delivered: had it not, this thread would have drawn the samples and the bands would match anyway.
    expect(notices).toEqual([]);
    const one = computeTargets(await loadPlanFile('demo/exciter.plan.json'), { trials: 4000, seed: 3 });
    expect(two).toEqual(one);
    expect(progress.at(-1)).toBe(4000);
  }, 60_000);
});

describe('probebook targets with PROBEBOOK_THREADS', () => {
  test('the variable reads 1 (one thread), 2 (the worker) and anything else (decide)', () => {
    expect(threadsFromEnv('1')).toBe('one');
    expect(threadsFromEnv('2')).toBe('always');
    expect(threadsFromEnv(undefined)).toBe('auto');
    expect(threadsFromEnv('many')).toBe('auto');
  });

  test('the command prints the same targets on one thread and with the worker (in process)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'probebook-threads-'));
    try {
      const out: Record<string, string> = {};
      for (const threads of ['1', '2']) {
        let stdout = '';
        let stderr = '';
        const status = await main(['targets', 'demo/exciter.plan.json', '--json', '--trials', '3000'], {
          stdout: (t) => (stdout += t),
          // With PROBEBOOK_THREADS=2 a worker that did not deliver would be said here.
          stderr: (t) => (stderr += t),
          // A cache of its own per run: the second must compute, not read the first's.
          env: { PROBEBOOK_CACHE: join(dir, threads), PROBEBOOK_THREADS: threads },
          cwd: process.cwd(),
        });
        expect(status).toBe(0);
        expect(stderr).toBe('');
        out[threads] = stdout;
      }
      expect(out['2']).toBe(out['1']);
      expect(JSON.parse(out['1'] ?? '{}').targets.length).toBeGreaterThan(20);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
