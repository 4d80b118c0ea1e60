// `npm run bench plan-size`: loading a plan, building its chain, one chain evaluation
// and computing its targets for an invented chain of RC low-passes, each loading the
// one before, with the growth ratio per doubling.
// Loading, building and one evaluation run at 50, 100 and 200 stages (200 is the
// plan limit). Loading and building are linear (about 2× per doubling). One
// evaluation (every part moved) asks every stage's load at its corner-search
// frequencies, each a pass down the rest of the ladder: about 4× per doubling; the
// harmonics are remembered per sample (src/plan/chain.ts), the corner searches'
// frequencies are each stage's own. `computeTargets` runs the worst-case
// search over every part for every stage (stages × parts evaluations, each of the
// whole chain): measured 10 → 20 → 40 stages 0.23, 1.4, 20 s (×6, ×14 per
// doubling; 0.43, 4.3, 56 s before the loads were remembered), so it runs at 5,
// 10 and 20 stages only; 200 stages would take hours (see src/plan/read-file.ts).
import { buildChain, spreadOf } from '../src/plan/chain.js';
import { loadPlanText } from '../src/plan/load.js';
import { computeTargets } from '../src/analysis/targets.js';

function chainPlan(n: number): string {
  const stages: unknown[] = [{ id: 'src', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz' }];
  for (let i = 0; i < n - 1; i++)
    stages.push({ id: `f${i}`, kind: 'rc-lowpass', input: i === 0 ? 'src.out' : `f${i - 1}.out`, parts: { R: '1k 1%', C: '10n 5%' } });
  return JSON.stringify({ plan: 'gen', title: 'Generated chain (invented)', rails: [{ id: '+12V', nominal: '12 V', tol: '3%' }], stages });
}

/** Median over 5 rounds of the mean time of `repeat` calls, after one call to warm up (the machine is shared: medians). */
function time(fn: () => unknown, repeat = 1): number {
  fn();
  const rounds: number[] = [];
  for (let r = 0; r < 5; r++) {
    const t0 = performance.now();
    for (let i = 0; i < repeat; i++) fn();
    rounds.push((performance.now() - t0) / repeat);
  }
  rounds.sort((a, b) => a - b);
  return rounds[2] as number;
}

/**
 * One chain evaluation per call, each at a new sample with every part moved within
 * its tolerance, as a Monte Carlo trial or a worst-case point has them (at the
 * nominal, a uniform ladder's stages far from its end see the same load to the last
 * bit and ask the same frequencies, which flatters the remembered loads).
 */
function evaluation(n: number): number {
  const chain = buildChain(loadPlanText(chainPlan(n), 'gen.plan.json'));
  const out = new Float64Array(chain.checks.length);
  const x = Float64Array.from(chain.nominal);
  // A fixed pseudo-random sequence (a 32-bit linear congruential generator, Numerical Recipes' constants), the same every run.
  let seed = 12345;
  const unit = (): number => {
    seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
    return seed / 2 ** 32;
  };
  const step = (): void => {
    chain.variables.forEach((v, i) => {
      x[i] = v.nominal + (2 * unit() - 1) * spreadOf(v);
    });
    chain.evaluate(x, out);
  };
  return time(step, Math.max(2, Math.round(400 / n)));
}

function ratios<T extends { n: number }>(rows: readonly T[], keys: readonly (keyof T & string)[]): void {
  for (let i = 1; i < rows.length; i++) {
    const a = rows[i - 1];
    const b = rows[i];
    if (!a || !b) continue;
    console.log(`  ${a.n} → ${b.n} stages: ${keys.map((k) => `${k} ×${((b[k] as number) / (a[k] as number)).toFixed(2)}`).join(', ')}`);
  }
}

const rows: { n: number; load: number; build: number; evaluate: number }[] = [];
for (const n of [50, 100, 200]) {
  const text = chainPlan(n);
  const load = time(() => loadPlanText(text, 'gen.plan.json'), 5);
  const plan = loadPlanText(text, 'gen.plan.json');
  const build = time(() => buildChain(plan), 5);
  const evaluate = evaluation(n);
  rows.push({ n, load, build, evaluate });
  console.log(`${String(n).padStart(4)} stages: load ${load.toFixed(1)} ms, build chain ${build.toFixed(2)} ms, one evaluation ${evaluate.toFixed(2)} ms`);
}
ratios(rows, ['load', 'build', 'evaluate']);

const targetRows: { n: number; targets: number }[] = [];
for (const n of [5, 10, 20]) {
  const plan = loadPlanText(chainPlan(n), 'gen.plan.json');
  // Once: computeTargets remembers its result per plan object.
  const t0 = performance.now();
  computeTargets(plan, { trials: 200, seed: 1 });
  const targets = performance.now() - t0;
  targetRows.push({ n, targets });
  console.log(`${String(n).padStart(4)} stages: targets (200 trials, worst-case search included) ${targets.toFixed(0)} ms`);
}
ratios(targetRows, ['targets']);
