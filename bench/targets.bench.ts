// Tolerance engine speed: 10,000 Monte Carlo trials of the whole demo exciter
// chain (plus its worst case and sensitivities), against the same number of
// evaluations of the cheapest stage, a divider. Goal: under 250 ms on one core,
// excluding Node start-up. Figures only; nothing here fails a build.
// Times are this process's CPU time (process.cpuUsage, user + system), not wall
// time: on a shared, loaded machine wall time mostly measures the other jobs.
import { buildChain } from '../src/plan/chain.js';
import { loadPlanFile, loadPlanText } from '../src/plan/load.js';
import { computeTargets } from '../src/analysis/targets.js';
import { sampleChain } from '../src/analysis/sampling.js';
import { cpuMs, median } from './timing.js';

const trials = 10_000;
const rounds = 5;

const plan = await loadPlanFile('demo/exciter.plan.json');
const divider = loadPlanText(
  JSON.stringify({
    plan: 'bench-divider',
    title: 'one divider (invented values)',
    rails: [{ id: '+12V', nominal: '12 V', tol: '1%' }],
    stages: [{ id: 'ref', kind: 'divider', from: '+12V', parts: { Rtop: '10k 1%', Rbottom: '10k 1%' } }],
  }),
  'bench-divider.plan.json',
);

const chain = buildChain(plan);
const dividerChain = buildChain(divider);
const dividerKind = divider.stages[0]?.module;
const dividerStage = divider.stages[0];
if (!dividerKind || !dividerStage) throw new Error('no divider stage');

// Warm up the JIT on every path once.
computeTargets(plan, { trials: 500 });
sampleChain(dividerChain, { trials: 500, seed: 1, distribution: 'normal' });

const full: number[] = [];
const mcOnly: number[] = [];
const divStage: number[] = [];
const divChain: number[] = [];
const yardstick: number[] = [];
for (let r = 0; r < rounds; r++) {
  full.push(cpuMs(() => computeTargets(plan, { trials, seed: r + 1 })));
  mcOnly.push(cpuMs(() => sampleChain(chain, { trials, seed: r + 1, distribution: 'normal' })));
  divChain.push(cpuMs(() => sampleChain(dividerChain, { trials, seed: r + 1, distribution: 'normal' })));
  // The divider's trials are too short to time alone: time twenty times as many and scale.
  divStage.push(
    cpuMs(() => {
      const parts = { Rtop: 10_000, Rbottom: 10_000 };
      let sink = 0;
      for (let i = 0; i < 20 * trials; i++) {
        parts.Rtop = 10_000 + (i % 7);
        const out = dividerKind.evaluate({
          parts,
          settings: dividerStage.settings,
          opamp: dividerStage.opamp,
          supplies: { pos: 12, neg: 0 },
          rails: { '+12V': 12 },
        });
        sink += out.values['out.dc'] ?? 0;
      }
      if (sink === 42) console.log('');
    }) / 20,
  );
  // A yardstick of the machine's speed right now: a million Math.exp calls.
  yardstick.push(
    cpuMs(() => {
      let sink = 0;
      for (let i = 0; i < 1_000_000; i++) sink += Math.exp((i & 1023) * -1e-3);
      if (sink === 42) console.log('');
    }),
  );
}

const ms = (x: number) => `${x.toFixed(1)} ms`;
console.log(
  `demo exciter: ${plan.stages.length} stages, ${chain.variables.filter((v) => v.tol > 0).length} toleranced variables, ${chain.checks.length} checks; ${trials} trials, median of ${rounds}`,
);
console.log(`computeTargets (worst case + sensitivities + Monte Carlo + bands): ${ms(median(full))}  (goal < 250 ms)`);
console.log(
  `Monte Carlo alone:                                             ${ms(median(mcOnly))}  (${((median(mcOnly) / trials) * 1000).toFixed(1)} µs per trial)`,
);
console.log(`one-divider chain, same trials:                                ${ms(median(divChain))}`);
console.log(`divider stage evaluate alone, same count:                      ${ms(median(divStage))}`);
console.log(`ratio computeTargets / divider evaluations:                    ${(median(full) / median(divStage)).toFixed(1)}×`);
console.log(`ratio Monte Carlo / one-divider chain:                         ${(median(mcOnly) / median(divChain)).toFixed(1)}×`);
console.log(
  `a million Math.exp (machine yardstick):                        ${ms(median(yardstick))}; computeTargets = ${(median(full) / median(yardstick)).toFixed(1)} yardsticks`,
);

// Where the time goes: each stage's own evaluate at nominal, µs per call.
const detail = chain.detail(chain.nominal);
const perStage: string[] = [];
for (const s of plan.stages) {
  const parts: Record<string, number> = {};
  for (const [role, p] of Object.entries(s.parts)) parts[role] = p.nominal;
  const input = s.input ? detail.outputs[`${s.input.stage}.${s.input.output}`] : undefined;
  const rails = Object.fromEntries(plan.rails.map((r) => [r.id, r.nominal]));
  const supplies = { pos: Math.max(0, ...plan.rails.map((r) => r.nominal)), neg: Math.min(0, ...plan.rails.map((r) => r.nominal)) };
  // As the Monte Carlo calls it: a trial (no warnings, bench accuracy).
  const base = { parts, settings: s.settings, opamp: s.opamp, supplies, rails, isTrial: true };
  const arg = input ? { ...base, input } : base;
  const n = 1000;
  for (let i = 0; i < 100; i++) s.module.evaluate(arg);
  const t = cpuMs(() => {
    for (let i = 0; i < n; i++) s.module.evaluate(arg);
  });
  perStage.push(`${s.id} (${s.kind}) ${((t / n) * 1000).toFixed(1)} µs`);
}
console.log(`per stage evaluate (CPU, as a trial): ${perStage.join(', ')}`);

// Loading (issue 11) against the code before it, in this same run: set
// PROBEBOOK_BASELINE to a folder holding an older copy of the sources and demo
// plans (e.g. `git archive <commit> src data demo | tar -x -C /tmp/base`, with
// node_modules linked in) and both demo plans are timed with both, alternately.
const baseline = process.env['PROBEBOOK_BASELINE'];
const demoPlans = ['demo/exciter.plan.json', 'demo/line-driver.plan.json'];
{
  const mine = await Promise.all(demoPlans.map((f) => loadPlanFile(f)));
  type Compute = (p: unknown, o: { trials: number; seed: number }) => unknown;
  let old: { compute: Compute; plans: unknown[] } | undefined;
  if (baseline) {
    const oldTargets = (await import(`${baseline}/src/analysis/targets.ts`)) as { computeTargets: Compute };
    const oldLoad = (await import(`${baseline}/src/plan/load.ts`)) as { loadPlanFile: (f: string) => Promise<unknown> };
    old = { compute: oldTargets.computeTargets, plans: await Promise.all(demoPlans.map((f) => oldLoad.loadPlanFile(`${baseline}/${f}`))) };
  }
  demoPlans.forEach((file, k) => {
    const now: number[] = [];
    const before: number[] = [];
    const p = mine[k];
    if (!p) return;
    computeTargets(p, { trials: 500 });
    if (old) old.compute(old.plans[k], { trials: 500, seed: 1 });
    for (let r = 0; r < rounds; r++) {
      now.push(cpuMs(() => computeTargets(p, { trials, seed: 100 + r })));
      if (old) {
        const o = old;
        before.push(cpuMs(() => o.compute(o.plans[k], { trials, seed: 100 + r })));
      }
    }
    const line = `targets ${file}: ${ms(median(now))} with loading`;
    console.log(
      old
        ? `${line}, ${ms(median(before))} before it (${baseline}); ratio ${(median(now) / median(before)).toFixed(2)}× (goal ≤ 1.5×)`
        : `${line} (set PROBEBOOK_BASELINE to compare with older sources)`,
    );
  });
}
