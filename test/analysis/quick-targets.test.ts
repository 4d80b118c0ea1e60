import { describe, expect, test } from 'vitest';
import { quickTargets } from '../../src/analysis/quick-targets.js';
import { computeTargets } from '../../src/analysis/targets.js';
import { loadPlanFile, loadPlanText } from '../../src/plan/load.js';

/** A 10k/10k 1 % divider from a 12 V 1 % rail (invented values). */
const divider = () =>
  loadPlanText(
    JSON.stringify({
      plan: 'div',
      title: 'divider (invented values)',
      rails: [{ id: '+12V', nominal: '12 V', tol: '1%' }],
      idleCurrent: { max: '10 mA' },
      stages: [{ id: 'ref', kind: 'divider', from: '+12V', parts: { Rtop: '10k 1%', Rbottom: '10k 1%' } }],
    }),
    'div.plan.json',
  );

describe('quick targets: the nominal exactly, both bands estimated from the sensitivities', () => {
  test('a divider: the first-order worst case and the GUM root-sum-square band (closed forms)', () => {
    const t = quickTargets(divider()).targets.find((x) => x.check === 'ref.out.dc');
    // Vout = V·Rb/(Rt+Rb) = 6 V; relative sensitivities 1 (V), +½ (Rb), −½ (Rt) (hand arithmetic).
    expect(t?.nominal).toBeCloseTo(6, 12);
    // First-order worst case: 6·(1 % + ½ % + ½ %) = ±0.12 V; the central differences carry a
    // second-order error of about (tol/3)², 1e-5 of it.
    expect(Math.abs((t?.worst.max ?? 0) - 6.12)).toBeLessThan(1e-5);
    expect(Math.abs((t?.worst.min ?? 0) - 5.88)).toBeLessThan(1e-5);
    // JCGM 100:2008 eq. 10 with tolerance = 3σ: ±3·6·√((1 %/3)² + 2·(0.5 %/3)²) = ±6·√(1.5e-4) V.
    const half = 6 * Math.sqrt(1e-4 + 2 * 0.25e-4);
    expect(Math.abs((t?.stat.max ?? 0) - 6 - half)).toBeLessThan(1e-5);
    expect(Math.abs(6 - (t?.stat.min ?? 0) - half)).toBeLessThan(1e-5);
  });

  test('the demo exciter: the same checks and nominals as the full computation, marked as an estimate', async () => {
    const quick = quickTargets(await loadPlanFile('demo/exciter.plan.json'));
    const full = computeTargets(await loadPlanFile('demo/exciter.plan.json'), { trials: 2000 });
    expect(quick.isEstimate).toBe(true);
    expect(full.isEstimate).toBeUndefined();
    expect(quick.targets.map((t) => t.check)).toEqual(full.targets.map((t) => t.check));
    for (const [i, t] of quick.targets.entries()) {
      expect(t.nominal).toBe(full.targets[i]?.nominal);
      // A floor (a THD, a dead band) bounds the estimate as it bounds the reading.
      if (t.floor !== undefined) expect(t.worst.min).toBeGreaterThanOrEqual(t.floor);
      if (Number.isFinite(t.nominal)) expect(t.stat.min <= t.nominal && t.nominal <= t.stat.max).toBe(true);
    }
    // Design warnings come from the nominal evaluation: the same set.
    expect(quick.warnings).toEqual(full.warnings);
  });
});
