import { beforeAll, describe, expect, test } from 'vitest';
import { diagnose, type DiagnosisReading } from '../../src/analysis/diagnose.js';
import { computeTargets } from '../../src/analysis/targets.js';
import type { Target } from '../../src/analysis/types.js';
import { uncertaintyFor, verdictFor } from '../../src/analysis/verdict.js';
import { buildChain, type ChainFault } from '../../src/plan/chain.js';
import { loadPlanFile, loadPlanText } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { uncertaintyKey } from '../../src/units/unit.js';
import { faultSetPlans } from './fixtures/fault-set.js';

let exciter: Plan;
let exciterTargets: readonly Target[];
let filter: Plan;
let filterTargets: readonly Target[];

beforeAll(async () => {
  exciter = await loadPlanFile('demo/exciter.plan.json');
  exciterTargets = computeTargets(exciter, { trials: 1000 }).targets;
  filter = loadPlanText(JSON.stringify(faultSetPlans['filter']), 'filter.plan.json');
  filterTargets = computeTargets(filter, { trials: 1000 }).targets;
});

/** Readings of the given checks as the plan's own model predicts them for one change, judged against the targets. */
function readingsOf(
  plan: Plan,
  targets: readonly Target[],
  checks: readonly string[],
  change: { part?: string; value?: number; fault?: ChainFault } = {},
): DiagnosisReading[] {
  const chain = buildChain(plan);
  const x = Float64Array.from(chain.nominal);
  if (change.part) x[chain.variables.findIndex((v) => v.name === change.part)] = change.value ?? Number.NaN;
  const values = chain.detail(x, undefined, change.fault).values;
  return checks.map((check) => {
    const t = targets.find((u) => u.check === check) as Target;
    const value = Number.isFinite(values[check]) ? (values[check] as number) : 0;
    return { check, value, verdict: verdictFor(t, value, uncertaintyFor(plan, check, uncertaintyKey(t.unit))).verdict };
  });
}

describe('diagnose', () => {
  test('all readings passing: no hypothesis, and it says so', () => {
    const d = diagnose(exciter, exciterTargets, readingsOf(exciter, exciterTargets, ['rails.+12V.dc', 'osc.freq', 'osc.square.vpp']));
    expect(d).toMatchObject({ hypotheses: [], unexplained: [], allPass: true });
  });

  // The case: a square of 1.37 V peak-to-peak with the rails and the frequency in band. A zener
  // fitted backwards does not give it (ngspice, test/circuit/faults.test.ts: two forward drops on one side,
  // the other unclamped), and the old single-reading search named rails at ±4.61 V and R2 = 6.52 kΩ, values
  // at or beyond the jump where the oscillator stops. None of those may be listed now.
  test('the 1.37 Vpp square: no rail and no R2 at the edge of the jump; the square is unexplained, the zener hint first', () => {
    const readings: DiagnosisReading[] = [
      ...readingsOf(exciter, exciterTargets, ['rails.+12V.dc', 'rails.-12V.dc', 'osc.freq']),
      { check: 'osc.square.vpp', value: 1.37, verdict: 'fail' },
    ];
    const d = diagnose(exciter, exciterTargets, readings);
    expect(d.hypotheses.filter((h) => h.part.startsWith('rails.') || h.part === 'osc.R2')).toEqual([]);
    for (const h of d.hypotheses) expect(Math.abs((h.predicted['osc.square.vpp'] ?? 0) - 1.37), h.label).toBeLessThan(0.1);
    expect(d.unexplained).toContain('osc.square.vpp');
    expect(d.hints.find((h) => h.check === 'osc.square.vpp')?.hints[0]).toMatch(/zener fitted backwards/);
  });

  test('a backwards zener, read on every stage, names the zener pair first with its designators', () => {
    const checks = exciterTargets.filter((t) => t.phase === 'stage' || t.phase === 'rails').map((t) => t.check);
    const d = diagnose(
      exciter,
      exciterTargets,
      readingsOf(exciter, exciterTargets, checks, { fault: { stage: 'osc', role: 'clamp', mode: 'reversed', variant: 1 } }),
    );
    expect(d.hypotheses[0]).toMatchObject({ part: 'osc.clamp', ref: 'D3/D4', mode: 'reversed', variant: 1, variantWords: 'low-side zener backwards' });
    expect(d.hypotheses[0]?.short).toMatch(/^osc\.clamp \(D3\/D4\) reversed \(low-side zener backwards\): osc\.\S+ would read/);
  });

  test('R and C of one RC product are one ambiguity, with what would separate them', () => {
    // C ten times its value: the corner falls tenfold and the 1 kHz signal is cut; R ten times gives the same.
    const d = diagnose(
      filter,
      filterTargets,
      readingsOf(filter, filterTargets, ['rails.+12V.dc', 'in.out.vpp', 'filt.out.vpp', 'amp.out.vpp'], { part: 'filt.C', value: 220e-9 }),
    );
    const top = d.hypotheses[0];
    expect([top?.part, ...(top?.alternatives.map((a) => a.part) ?? [])].sort()).toEqual(expect.arrayContaining(['filt.C', 'filt.R']));
    expect(top?.separate).toMatch(/filt\.R.*filt\.C|filt\.C.*filt\.R/);
    // Both move the corner alike: no check of the plan tells them apart, only the parts measured in place.
    expect(top?.separate).toMatch(/no check of the plan tells/);
  });

  test('the next check is the unread one that best separates the hypotheses', () => {
    // A low amplifier output alone: the gain resistors, the filter and the generator level all fit it.
    // Reading the filter output splits them (filter or generator vs gain stage): it is the most informative.
    const d = diagnose(filter, filterTargets, readingsOf(filter, filterTargets, ['rails.+12V.dc', 'amp.out.vpp'], { part: 'amp.Rf', value: 18e3 }));
    expect(d.hypotheses.length).toBeGreaterThan(1);
    expect(d.next?.check).toMatch(/^(filt\.out\.vpp|amp\.gain|in\.out\.vpp)$/);
    expect(d.next?.why).toMatch(/bits expected/);
  });

  test('scores are normalised over the listed hypotheses; a decade slip outranks an off-standard value fitting as well', () => {
    const d = diagnose(
      filter,
      filterTargets,
      readingsOf(filter, filterTargets, ['rails.+12V.dc', 'in.out.vpp', 'filt.out.vpp', 'amp.gain', 'amp.out.vpp'], { part: 'amp.Rf', value: 220e3 }),
    );
    const total = d.hypotheses.reduce((s, h) => s + h.score, 0);
    expect(total).toBeCloseTo(1, 6);
    // Ranked by score, a group by its members' summed score.
    const scores = d.hypotheses.map((h) => h.score);
    expect(scores).toEqual([...scores].sort((a, b) => b - a));
    const first = d.hypotheses[0];
    expect(first?.valueClass).toMatch(/decade/);
  });
});
