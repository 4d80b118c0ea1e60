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
});
