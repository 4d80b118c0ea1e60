// A real temporary bench log built through the store, for the review command
// and screen tests. Boards, serials, operators and values are invented.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target, TargetSet } from '../../src/analysis/types.js';
import { uncertaintyFor, verdictFor } from '../../src/analysis/verdict.js';
import { openLog, type LogStore } from '../../src/log/store.js';
import type { Plan } from '../../src/plan/types.js';
import { loadPlanText } from '../../src/plan/load.js';

export const planFile = join(import.meta.dirname, 'fixtures', 'osc-demo.plan.json');

export interface TestLog {
  readonly dir: string;
  readonly log: LogStore;
  readonly plan: Plan;
  readonly targets: TargetSet;
  target(check: string): Target;
}

const pause = () => new Promise((r) => setTimeout(r, 3));

export async function makeLog(planText = readFileSync(planFile, 'utf8')): Promise<TestLog> {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-review-'));
  const log = await openLog(dir);
  const plan = loadPlanText(planText, 'osc-demo.plan.json');
  const targets = computeTargets(plan);
  return {
    dir,
    log,
    plan,
    targets,
    target(check) {
      const t = targets.targets.find((x) => x.check === check);
      if (!t) throw new Error(`no target ${check} in the fixture plan; it has ${targets.targets.map((x) => x.check).join(', ')}`);
      return t;
    },
  };
}

/** One run on a board: each reading judged against the plan's targets as `record` would. */
export async function runBoard(t: TestLog, serial: string, values: Readonly<Record<string, number>>, operator = 'tess'): Promise<void> {
  const run = await t.log.startRun(serial, { plan: t.plan.plan, planHash: t.plan.hash, planText: t.plan.text, operator });
  let failed = false;
  for (const [check, value] of Object.entries(values)) {
    const target = t.target(check);
    const { verdict } = verdictFor(target, value, uncertaintyFor(t.plan, check, target.unit));
    if (verdict !== 'pass') failed = true;
    await t.log.appendReading(serial, { run: run.id, check, value, unit: target.unit, raw: String(value), operator, verdict, planHash: t.plan.hash });
    await pause();
  }
  await t.log.endRun(serial, run.id, failed ? 'failed' : 'passed');
  await pause();
}

/** A rework note between runs. */
export async function rework(t: TestLog, serial: string, part: string, from: string, to: string, note: string): Promise<void> {
  await t.log.addRework(serial, { run: null, part, from, to, note, operator: 'tess' });
  await pause();
}
