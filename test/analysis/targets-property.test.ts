import fc from 'fast-check';
import { describe, test } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import { loadPlanText } from '../../src/plan/load.js';
import { fakeKinds } from '../plan/fake-kinds.js';

// E12 mantissas (IEC 60063:2015) and common tolerances, to draw invented dividers from.
const e12 = [1, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const tolerances = [0.1, 0.5, 1, 2, 5, 10];

const resistor = fc.record({ m: fc.constantFrom(...e12), decade: fc.integer({ min: 2, max: 5 }), tol: fc.constantFrom(...tolerances) });

describe('divider bands over random parts (fast-check)', () => {
  test('worst case = closed-form corners V·Rb/(Rt+Rb); statistical band inside it', () => {
    fc.assert(
      fc.property(resistor, resistor, fc.constantFrom(5, 9, 12, 15), fc.constantFrom(0.5, 1, 3, 5), (top, bottom, volts, railTol) => {
        const rt = Number((top.m * 10 ** top.decade).toPrecision(3));
        const rb = Number((bottom.m * 10 ** bottom.decade).toPrecision(3));
        const plan = loadPlanText(
          JSON.stringify({
            plan: 'p',
            title: 'random divider (invented values)',
            rails: [{ id: 'V', nominal: `${volts} V`, tol: `${railTol}%` }],
            stages: [{ id: 'd', kind: 'divider', from: 'V', parts: { Rtop: `${rt} ohm ${top.tol}%`, Rbottom: `${rb} ohm ${bottom.tol}%` } }],
          }),
          'p.plan.json',
          fakeKinds,
        );
        const t = computeTargets(plan, { trials: 300, seed: 1 }).targets.find((x) => x.check === 'd.out.dc');
        if (!t) return false;
        const v = (s: number, a: number, b: number) =>
          (volts * (1 + (s * railTol) / 100) * rb * (1 + (b * bottom.tol) / 100)) / (rt * (1 + (a * top.tol) / 100) + rb * (1 + (b * bottom.tol) / 100));
        const hi = v(1, -1, 1);
        const lo = v(-1, 1, -1);
        const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.abs(b);
        return (
          close(t.worst.max, hi) &&
          close(t.worst.min, lo) &&
          t.stat.min >= t.worst.min &&
          t.stat.max <= t.worst.max &&
          t.stat.min < t.nominal &&
          t.nominal < t.stat.max
        );
      }),
      { numRuns: 25, seed: 42 },
    );
  });
});
