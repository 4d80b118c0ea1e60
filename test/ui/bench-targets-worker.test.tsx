import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { loadPlanText } from '../../src/plan/load.js';
import { targetsOffThread } from '../../src/ui/bench/targets-off-thread.js';
import { fixturePlan } from './render-app.js';

const plan = loadPlanText(JSON.stringify(fixturePlan), 'fixture.plan.json');

describe('targets off the UI thread', () => {
  test('the worker gives exactly the numbers of the same seeded computation here, with progress', async () => {
    const progress: [number, number][] = [];
    const job = targetsOffThread(plan, 3000, 7, (done, total) => progress.push([done, total]));
    expect(job).not.toBeNull();
    const there = await job;
    const here = computeTargets(plan, { trials: 3000, seed: 7 });
    // Same seed, same code: identical to the last bit (structured clone keeps ±Infinity).
    expect(there).toEqual(here);
    expect(progress.length).toBeGreaterThan(0);
    expect(progress.every(([done, total]) => total === 3000 && done > 0 && done <= total)).toBe(true);
    expect(progress[progress.length - 1]).toEqual([3000, 3000]);
  });

  test('a plan the worker cannot load is refused with the loader’s message', async () => {
    const broken = { ...plan, text: '{"plan": "x"', file: 'broken.plan.json' };
    await expect(targetsOffThread(broken, 100, 1)).rejects.toThrow(/broken\.plan\.json/);
  });

  test('a running worker never keeps the process alive by itself (quitting the app does not wait for it)', () => {
    // A script that starts a long computation and has nothing else to do: it must end without
    // waiting for the worker. Were it held, "done" would be printed when the targets arrived.
    const root = join(import.meta.dirname, '..', '..');
    const script = `
      import { loadPlanText } from ${JSON.stringify(join(root, 'src/plan/load.ts'))};
      import { targetsOffThread } from ${JSON.stringify(join(root, 'src/ui/bench/targets-off-thread.ts'))};
      const plan = loadPlanText(process.argv[1], 'fixture.plan.json');
      targetsOffThread(plan, 5000000, 1, (done) => done > 0 && console.log('progress'))?.then(() => console.log('done'));
      console.log('started');`;
    const run = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script, JSON.stringify(fixturePlan)], {
      cwd: root,
      encoding: 'utf8',
      timeout: 60_000,
    });
    expect(run.error).toBeUndefined();
    expect(run.status, run.stderr).toBe(0);
    expect(run.stdout).toContain('started');
    expect(run.stdout).not.toContain('done');
  }, 70_000);
});
