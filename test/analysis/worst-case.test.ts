import { describe, expect, test } from 'vitest';
import { sensitivities } from '../../src/analysis/sensitivity.js';
import { sampleChain } from '../../src/analysis/sampling.js';
import { computeTargets } from '../../src/analysis/targets.js';
import { targetsJson } from '../../src/analysis/targets-json.js';
import { worstCase } from '../../src/analysis/worst-case.js';
import { buildChain, spreadOf } from '../../src/plan/chain.js';
import { loadPlanFile, loadPlanText } from '../../src/plan/load.js';
import { mirroredShaper } from './fixtures/shaper-branches.js';

/*
 * The worst-case search against brute force. A diode shaper driven by a bench
 * triangle whose level is toleranced: its THD is not monotone in the drive (it
 * has a best drive level in the middle of the box, where the breakpoints fit the
 * triangle best), so its lower bound lies inside the box, not at a corner, and
 * the sensitivity corner is not its worst. The reference is a dense grid over the
 * same five-variable box (9^5 = 59,049 evaluations of the same chain), i.e. an
 * exhaustive evaluation independent of any search. Invented values.
 */
const planText = JSON.stringify({
  plan: 'wc-grid',
  title: 'shaper on a bench triangle (invented values)',
  rails: [
    { id: '+12V', nominal: '12 V' },
    { id: '-12V', nominal: '-12 V' },
  ],
  stages: [
    // 3.25 V peak is about the drive where this shaper's THD is least (0.8 %); ±10 % spans both sides of it.
    { id: 'in', kind: 'signal-in', shape: 'triangle', peak: '3.25 V 10%', frequency: '1 kHz' },
    mirroredShaper('in.out', '6k8 2%', [
      { R: '15k', bias: 0.7 },
      { R: '1k5 5%', Rneg: '1k5', bias: 1.5 },
    ]),
  ],
});

// The diode's IS and N keep their default spreads (±50 %, ±2 %): the box has five dimensions.
const planExact = planText;

function gridExtremes(chain: ReturnType<typeof buildChain>, check: number, steps: number): { min: number; max: number } {
  const varied = chain.variables.flatMap((v, i) => (spreadOf(v) > 0 ? [i] : []));
  const x = Float64Array.from(chain.nominal);
  const out = new Float64Array(chain.checks.length);
  let min = Infinity;
  let max = -Infinity;
  const total = steps ** varied.length;
  for (let m = 0; m < total; m++) {
    let r = m;
    for (const i of varied) {
      const k = r % steps;
      r = Math.floor(r / steps);
      const v = chain.variables[i];
      if (v) x[i] = v.nominal + ((2 * k) / (steps - 1) - 1) * spreadOf(v);
    }
    chain.evaluate(x, out);
    const y = out[check] as number;
    if (y < min) min = y;
    if (y > max) max = y;
  }
  return { min, max };
}

describe('worst case: deterministic search of the tolerance box', () => {
  const plan = loadPlanText(planExact, 'wc-grid.plan.json');
  const chain = buildChain(plan);
  const thd = chain.checks.findIndex((c) => c.check === 'shaper.out.thd');
  const perSigma = sensitivities(chain);

  test('the box has the five intended variables', () => {
    const varied = chain.variables.filter((v) => spreadOf(v) > 0).map((v) => v.name);
    expect(varied.sort()).toEqual(['in.peak', 'shaper.Rs', 'shaper.branches[2].R', 'shaper.diode.is', 'shaper.diode.n'].sort());
  });

  test('THD over the box: the search (forced, no corner enumeration) and the corners-plus-search path both match a 9^5 grid', () => {
    const grid = gridExtremes(chain, thd, 9);
    // The grid's best drive lies between its nodes at best: the search may find a little lower
    // (and a little higher), never less extreme than the grid by more than rounding.
    for (const limit of [0, 10]) {
      const w = worstCase(chain, perSigma, { maxCornerVariables: limit });
      const lo = w.min[thd] as number;
      const hi = w.max[thd] as number;
      console.log(
        `THD limit ${limit}: search ${lo.toExponential(4)} … ${hi.toExponential(4)}, grid ${grid.min.toExponential(4)} … ${grid.max.toExponential(4)}, ${w.evaluations} evaluations, ${w.method[thd]}`,
      );
      // Upper side: the maximum sits at a vertex of the box, which the 9-point grid contains: equal within 1e-9 relative.
      expect(hi).toBeGreaterThanOrEqual(grid.max * (1 - 1e-9));
      expect(hi).toBeLessThanOrEqual(grid.max * (1 + 0.01));
      // Lower side: an interior minimum; the search must reach the grid's (within 0.5 % of it). It may go below the
      // grid by what the grid's spacing hides; anything 10 % below would be a point outside the box or a broken model.
      expect(lo).toBeLessThanOrEqual(grid.min * (1 + 0.005));
      expect(lo).toBeGreaterThanOrEqual(grid.min * 0.9);
      expect(w.method[thd]).toBe('search');
      expect(w.evaluations).toBeLessThan(grid.max > 0 ? 4000 : 0);
    }
  });

  test('a sensitivity corner alone would understate the THD band (why the search is needed)', () => {
    const x = Float64Array.from(chain.nominal);
    const out = new Float64Array(chain.checks.length);
    const ends: number[] = [];
    for (const side of [1, -1]) {
      chain.variables.forEach((v, i) => {
        x[i] = v.nominal + Math.sign(perSigma[i]?.[thd] ?? 0) * side * spreadOf(v);
      });
      chain.evaluate(x, out);
      ends.push(out[thd] as number);
    }
    const grid = gridExtremes(chain, thd, 5);
    // The low sensitivity corner is far above the interior minimum.
    expect(Math.min(...ends)).toBeGreaterThan(grid.min * 1.2);
  });

  test('the worst-case band does not depend on the trial count or the seed; the statistical band lies inside it', () => {
    const a = computeTargets(plan, { trials: 200, seed: 1 });
    const b = computeTargets(loadPlanText(planExact, 'again.plan.json'), { trials: 3000, seed: 77 });
    for (const [i, t] of a.targets.entries()) {
      const u = b.targets[i];
      expect(u?.check).toBe(t.check);
      expect(u?.worst).toEqual(t.worst);
      if (Number.isFinite(t.stat.min)) {
        expect(t.stat.min).toBeGreaterThanOrEqual(t.worst.min);
        expect(t.stat.max).toBeLessThanOrEqual(t.worst.max);
      }
    }
  });

  test('targets --json names the method that bound each band', async () => {
    const demo = await loadPlanFile('demo/exciter.plan.json');
    const json = targetsJson(computeTargets(demo, { trials: 300 })) as { targets: { check: string; method?: string }[] };
    const byCheck = new Map(json.targets.map((t) => [t.check, t.method] as const));
    // The shaper's THD is the non-monotone check of the demo; the filter corner moves one way with R and C.
    expect(byCheck.get('shaper.out.thd')).toBe('search');
    expect(byCheck.get('filt.fc')).toMatch(/^(monotone|corners)$/);
    // The rails alone: two variables, every corner. The oscillator: 13 variables with the op-amp's, beyond the corner limit.
    expect(byCheck.get('rails.+12V.dc')).toBe('corners');
    expect(byCheck.get('osc.freq')).toMatch(/^(monotone|search)$/);
    expect(byCheck.get('rails.idle-current')).toBeUndefined();
  });
});

describe('the searched worst case holds every Monte Carlo trial', () => {
  // 20,000 trials spread uniformly over the box (they reach its corners more often than the normal model)
  // on both demo plans: no trial may fall outside the searched band. Relative slack 1e-9 for rounding
  // between evaluation paths.
  for (const file of ['demo/exciter.plan.json', 'demo/line-driver.plan.json']) {
    test(file, async () => {
      const demo = await loadPlanFile(file);
      const set = computeTargets(demo, { trials: 200 });
      const chain = buildChain(demo);
      const samples = sampleChain(chain, { trials: 20_000, seed: 3, distribution: 'uniform' });
      chain.checks.forEach((c, i) => {
        const t = set.targets.find((x) => x.check === c.check);
        if (!t || t.isLimit) return;
        const values = samples.values[i] as Float64Array;
        const slack = 1e-9 * Math.max(Math.abs(t.worst.min), Math.abs(t.worst.max));
        let lo = Infinity;
        let hi = -Infinity;
        for (const v of values) {
          if (!Number.isFinite(v)) continue;
          lo = Math.min(lo, v);
          hi = Math.max(hi, v);
        }
        if (lo === Infinity) return;
        expect(lo, `${c.check} low`).toBeGreaterThanOrEqual(t.worst.min - slack);
        expect(hi, `${c.check} high`).toBeLessThanOrEqual(t.worst.max + slack);
      });
    });
  }
});
