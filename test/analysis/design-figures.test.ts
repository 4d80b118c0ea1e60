import { describe, expect, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { targetsJson } from '../../src/analysis/targets-json.js';
import { loadPlanFile } from '../../src/plan/load.js';
import { createRunState } from '../../src/run/create.js';

describe('design figures (checks nobody probes at a test point)', () => {
  test("the follower's peak currents are in targets, marked, and never on the bring-up list", async () => {
    const plan = await loadPlanFile('demo/exciter.plan.json');
    const set = computeTargets(plan, { trials: 200 });
    const figures = set.targets.filter((t) => t.isDesignFigure).map((t) => t.check);
    expect(figures).toEqual(['drive.out.ipeak', 'drive.base.ipeak']);
    const json = targetsJson(set) as { targets: { check: string; designFigure?: boolean }[] };
    expect(json.targets.filter((t) => t.designFigure === true).map((t) => t.check)).toEqual(figures);
    // Every other target carries no such key at all (the contract's shape is unchanged for them).
    expect(json.targets.filter((t) => !figures.includes(t.check)).every((t) => !('designFigure' in t))).toBe(true);
    const run = createRunState(plan, set.targets);
    const listed = run.targets.map((t) => t.check);
    for (const f of figures) expect(listed).not.toContain(f);
    // What a technician can probe stays: the new iq and offset checks among them.
    expect(listed).toEqual(expect.arrayContaining(['drive.out.vpp', 'drive.iq', 'drive.out.dc']));
  });
});
