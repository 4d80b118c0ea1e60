// `npm run bench plan-size`: loading a plan, building its chain and computing its
// targets at 50, 100 and 200 stages (an invented chain of RC low-passes), with the
// growth ratio per doubling. Linear steps grow about 2× per doubling; the
// one-part-at-a-time worst-case search and the corner warnings grow with
// stages × parts (about 4×); nothing should grow faster. 200 stages is the limit.
import { buildChain } from '../src/plan/chain.js';
import { loadPlanText } from '../src/plan/load.js';
import { computeTargets } from '../src/analysis/targets.js';

function chainPlan(n: number): string {
  const stages: unknown[] = [{ id: 'src', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz' }];
  for (let i = 0; i < n - 1; i++)
    stages.push({ id: `f${i}`, kind: 'rc-lowpass', input: i === 0 ? 'src.out' : `f${i - 1}.out`, parts: { R: '1k 1%', C: '10n 5%' } });
  return JSON.stringify({ plan: 'gen', title: 'Generated chain (invented)', rails: [{ id: '+12V', nominal: '12 V', tol: '3%' }], stages });
}

function time(fn: () => unknown, repeat = 1): number {
  const t0 = performance.now();
  for (let i = 0; i < repeat; i++) fn();
  return (performance.now() - t0) / repeat;
}

const rows: { n: number; load: number; build: number; targets: number }[] = [];
for (const n of [50, 100, 200]) {
  const text = chainPlan(n);
  const load = time(() => loadPlanText(text, 'gen.plan.json'), 5);
  const plan = loadPlanText(text, 'gen.plan.json');
  const build = time(() => buildChain(plan), 5);
  const targets = time(() => computeTargets(plan, { trials: 200, seed: 1 }));
  rows.push({ n, load, build, targets });
  console.log(`${String(n).padStart(4)} stages: load ${load.toFixed(1)} ms, build chain ${build.toFixed(2)} ms, targets (200 trials) ${targets.toFixed(0)} ms`);
}
for (let i = 1; i < rows.length; i++) {
  const a = rows[i - 1];
  const b = rows[i];
  if (!a || !b) continue;
  console.log(
    `${a.n} → ${b.n} stages: load ×${(b.load / a.load).toFixed(2)}, build ×${(b.build / a.build).toFixed(2)}, targets ×${(b.targets / a.targets).toFixed(2)}`,
  );
}
