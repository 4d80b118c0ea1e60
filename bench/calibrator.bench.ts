// Tolerance engine speed on the calibrator demo (regulators, zener, timer,
// transistor stage, comparator): computeTargets with 10,000 trials against
// the demo exciter's, and each stage's own evaluate per trial call, as ratios
// to a divider's. Figures only; nothing here fails a build. CPU time of this
// process (process.cpuUsage), not wall time, as targets.bench.ts does.
import { computeTargets } from '../src/analysis/targets.js';
import { buildChain } from '../src/plan/chain.js';
import { loadPlanFile } from '../src/plan/load.js';
import { cpuMs, median } from './timing.js';

const trials = 10_000;
const rounds = 3;

const calibrator = await loadPlanFile('demo/calibrator.plan.json');
const exciter = await loadPlanFile('demo/exciter.plan.json');
computeTargets(calibrator, { trials: 500 });
computeTargets(exciter, { trials: 500 });
const cal: number[] = [];
const exc: number[] = [];
for (let r = 0; r < rounds; r++) {
  cal.push(cpuMs(() => computeTargets(calibrator, { trials, seed: r + 1 })));
  exc.push(cpuMs(() => computeTargets(exciter, { trials, seed: r + 1 })));
}
console.log(
  `computeTargets, ${trials} trials, median of ${rounds}: calibrator ${median(cal).toFixed(1)} ms, exciter ${median(exc).toFixed(1)} ms, ratio ${(median(cal) / median(exc)).toFixed(2)}×`,
);

const chain = buildChain(calibrator);
const detail = chain.detail(chain.nominal);
const rails = Object.fromEntries(calibrator.rails.map((r) => [r.id, r.nominal]));
const supplies = { pos: Math.max(0, ...calibrator.rails.map((r) => r.nominal)), neg: Math.min(0, ...calibrator.rails.map((r) => r.nominal)) };
const perCall = (s: (typeof calibrator.stages)[number]) => {
  const parts: Record<string, number> = {};
  for (const [role, p] of Object.entries(s.parts)) parts[role] = p.nominal;
  const input = s.input ? detail.outputs[`${s.input.stage}.${s.input.output}`] : undefined;
  const base = { parts, settings: s.settings, opamp: s.opamp, supplies, rails, isTrial: true };
  const arg = input ? { ...base, input } : base;
  const n = 2000;
  for (let i = 0; i < 200; i++) s.module.evaluate(arg);
  return (
    (cpuMs(() => {
      for (let i = 0; i < n; i++) s.module.evaluate(arg);
    }) /
      n) *
    1000
  );
};
const us = calibrator.stages.map((s) => [s, median([perCall(s), perCall(s), perCall(s)])] as const);
const floor = Math.min(...us.map(([, t]) => t));
console.log(
  `per stage evaluate (CPU, as a trial), µs and × the cheapest: ${us.map(([s, t]) => `${s.id} (${s.kind}) ${t.toFixed(2)} µs ${(t / floor).toFixed(1)}×`).join(', ')}`,
);
