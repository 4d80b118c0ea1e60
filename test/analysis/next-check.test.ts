import { describe, expect, test } from 'vitest';
import { nextCheck } from '../../src/analysis/next-check.js';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target, Verdict } from '../../src/analysis/types.js';
import { loadPlanText } from '../../src/plan/load.js';
import { fakeKinds, fakePlan } from '../plan/fake-kinds.js';

// Order rules of DESIGN §5 (common practice, no source: shorts before power, current-limited first power).
const plan = loadPlanText(JSON.stringify(fakePlan()), 'fake.plan.json', fakeKinds);
const targets = computeTargets(plan, { trials: 200 }).targets;
const ids = targets.map((t) => t.check);

function doneWith(entries: readonly (readonly [string, Verdict])[]): Map<string, Verdict> {
  return new Map(entries);
}
const passed = (checks: readonly string[]) => checks.map((c) => [c, 'pass'] as const);
const beforeStages = ids.slice(0, 5);

describe('nextCheck', () => {
  test('walks the plan in safe order when everything passes', () => {
    const done = new Map<string, Verdict>();
    const seen: string[] = [];
    for (let n = nextCheck(targets, done); n; n = nextCheck(targets, done)) {
      seen.push(n.check);
      done.set(n.check, 'pass');
    }
    expect(seen).toEqual(ids);
    expect(nextCheck(targets, done)).toBeNull();
  });

  test('nothing is powered before every rail-to-ground check passes', () => {
    const n = nextCheck(targets, doneWith([['rails.+12V.to-ground', 'pass']]));
    expect(n?.check).toBe('rails.-12V.to-ground');
    const short = nextCheck(
      targets,
      doneWith([
        ['rails.+12V.to-ground', 'fail'],
        ['rails.-12V.to-ground', 'pass'],
      ]),
    );
    expect(short?.check).toBe('rails.+12V.to-ground');
    expect(short?.why).toMatch(/^power off: .*short/);
  });

  test('idle current above the limit says power off, before any rail or stage', () => {
    const done = doneWith([...passed(ids.slice(0, 2)), ['rails.idle-current', 'fail']]);
    const n = nextCheck(targets, done, { check: 'rails.idle-current', verdict: 'fail' });
    expect(n).toEqual({ check: 'rails.idle-current', why: expect.stringMatching(/^power off: the idle current is above the limit/) });
    expect(nextCheck(targets, doneWith([...passed(ids.slice(0, 2)), ['rails.idle-current', 'marginal']]))?.why).toMatch(/^power off/);
  });

  test('a rail out of band is read again before stages', () => {
    const done = doneWith([...passed(ids.slice(0, 3)), ['rails.+12V.dc', 'fail']]);
    expect(nextCheck(targets, done)?.check).toBe('rails.+12V.dc');
  });

  test('a failed stage reading sends the technician upstream: the feeding output first', () => {
    const done = doneWith([...passed(beforeStages), ['amp.out.vpp', 'fail']]);
    const n = nextCheck(targets, done, { check: 'amp.out.vpp', verdict: 'fail' });
    expect(n?.check).toBe('osc.triangle.vpp');
    expect(n?.why).toContain('upstream');
    // Once the feeding output is read, the input stage's other checks.
    done.set('osc.triangle.vpp', 'pass');
    expect(nextCheck(targets, done, { check: 'amp.out.vpp', verdict: 'fail' })?.check).toBe('osc.freq');
    // The divider is not upstream of amp, so with osc done the plan order resumes.
    done.set('osc.freq', 'pass');
    const after = nextCheck(targets, done, { check: 'amp.out.vpp', verdict: 'fail' });
    expect(after?.check).toBe('ref.out.dc');
    expect(after?.why).toContain('its own stage');
  });

  test('a marginal reading also looks upstream; a pass goes on in plan order', () => {
    const done = doneWith([...passed(beforeStages), ['amp.gain', 'marginal']]);
    expect(nextCheck(targets, done, { check: 'amp.gain', verdict: 'marginal' })?.check).toBe('osc.triangle.vpp');
    expect(nextCheck(targets, done, { check: 'amp.gain', verdict: 'pass' })?.check).toBe('ref.out.dc');
  });

  test('without upstream data on the targets, earlier stages stand in, nearest first', () => {
    const bare: Target[] = targets.map(({ upstream: _u, input: _i, ...t }) => t);
    const done = doneWith([...passed(beforeStages), ['amp.gain', 'fail']]);
    expect(nextCheck(bare, done, { check: 'amp.gain', verdict: 'fail' })?.check).toBe('osc.freq');
  });
});
