import { buildChain } from '../src/plan/chain.js';
import { loadPlanText } from '../src/plan/load.js';
import { computeTargets, prepareTargets } from '../src/analysis/targets.js';
import { sensitivities } from '../src/analysis/sensitivity.js';

function chainPlan(n: number): string {
  const stages: unknown[] = [{ id: 'src', kind: 'signal-in', shape: 'sine', peak: '1 V', frequency: '1 kHz' }];
  for (let i = 0; i < n - 1; i++)
    stages.push({ id: `f${i}`, kind: 'rc-lowpass', input: i === 0 ? 'src.out' : `f${i - 1}.out`, parts: { R: '1k 1%', C: '10n 5%' } });
  return JSON.stringify({ plan: 'gen', title: 'Generated chain (invented)', rails: [{ id: '+12V', nominal: '12 V', tol: '3%' }], stages });
}
const sizes = (process.env.SIZES ?? '5,10,20').split(',').map(Number);
for (const n of sizes) {
  const plan = loadPlanText(chainPlan(n), 'gen.plan.json');
  const chain = buildChain(plan);
  const out = new Float64Array(chain.checks.length);
  const x = Float64Array.from(chain.nominal);
  let t0 = performance.now();
  let k = 0;
  for (; k < 200; k++) {
    x[2] = chain.nominal[2]! * (1 + 1e-3 * (k % 7));
    chain.evaluate(x, out);
  }
  const evalMs = (performance.now() - t0) / k;
  t0 = performance.now();
  const sens = sensitivities(chain);
  const sensMs = performance.now() - t0;
  t0 = performance.now();
  const p = prepareTargets(plan);
  const prepMs = performance.now() - t0;
  t0 = performance.now();
  computeTargets(plan, { trials: 200, seed: 1 });
  const tMs = performance.now() - t0;
  console.log(
    `${n}: eval ${evalMs.toFixed(3)} ms, sens ${sensMs.toFixed(0)} ms, prepare ${prepMs.toFixed(0)} ms (wc evals ${p.worst.evaluations}), targets ${tMs.toFixed(0)} ms`,
  );
}
