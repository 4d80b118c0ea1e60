// Diagnosis speed: `diagnose` on the exciter demo board with a zener of its clamp
// pair fitted backwards, every check read as the demo log's EXB-0110 has them
// (28 readings since the driver's bias network came in, the unpowered and
// first-power checks included), every hypothesis verified through the whole chain.
// Goal: under 300 ms in process (a warm process, excluding Node start-up and the
// targets, which the screen and the command have cached). Against it, one chain
// evaluation (the unit of work: the search makes a few hundred) and an all-pass
// board (nothing to explain, the floor). Figures only; nothing here fails a build.
// Times are this process's CPU time (process.cpuUsage, user + system).
import { diagnose, type DiagnosisReading } from '../src/analysis/diagnose.js';
import { computeTargets } from '../src/analysis/targets.js';
import { uncertaintyFor, verdictFor } from '../src/analysis/verdict.js';
import { buildChain } from '../src/plan/chain.js';
import { loadPlanFile } from '../src/plan/load.js';
import { uncertaintyKey } from '../src/units/unit.js';
import { cpuMs, median } from './timing.js';

const rounds = 7;

const plan = await loadPlanFile('demo/exciter.plan.json');
const targets = computeTargets(plan, { trials: 2000 }).targets;
const chain = buildChain(plan);

function readingsFor(values: Readonly<Record<string, number>>): DiagnosisReading[] {
  return targets.map((t) => {
    // The unpowered and first-power checks as a healthy board reads them: open to ground, half the idle limit.
    const v = t.phase === 'unpowered' ? 1e5 : t.phase === 'first-power' ? t.worst.max / 2 : values[t.check];
    const value = v === undefined || !Number.isFinite(v) ? 0 : v;
    return { check: t.check, value, verdict: verdictFor(t, value, uncertaintyFor(plan, t.check, uncertaintyKey(t.unit))).verdict };
  });
}

const faulted = readingsFor(chain.detail(chain.nominal, undefined, { stage: 'osc', role: 'clamp', mode: 'reversed', variant: 0 }).values);
const healthy = readingsFor(chain.detail(chain.nominal).values);
const out = new Float64Array(chain.checks.length);
const x = Float64Array.from(chain.nominal);

// Warm up the JIT on every path once.
diagnose(plan, targets, faulted, { chain });
diagnose(plan, targets, healthy, { chain });

const full: number[] = [];
const fresh: number[] = [];
const pass: number[] = [];
const evals: number[] = [];
let named = '';
for (let r = 0; r < rounds; r++) {
  full.push(cpuMs(() => (named = diagnose(plan, targets, faulted, { chain }).hypotheses[0]?.part ?? 'nothing')));
  fresh.push(cpuMs(() => diagnose(plan, targets, faulted)));
  pass.push(cpuMs(() => diagnose(plan, targets, healthy, { chain })));
  // A rail moved each time: the chain keeps results of stages nothing changed in, a rail changes all.
  evals.push(
    cpuMs(() => {
      for (let i = 0; i < 200; i++) {
        x[0] = (chain.nominal[0] as number) * (1 + 1e-4 * (i % 2));
        chain.evaluate(x, out);
      }
    }) / 200,
  );
}

const t = median(full);
console.log(
  `diagnose, exciter demo, ${faulted.length} readings (${faulted.filter((x) => x.verdict !== 'pass').length} outside their band): ${t.toFixed(0)} ms (median of ${rounds}; goal < 300 ms) — first hypothesis ${named}`,
);
console.log(`  same with the chain built inside: ${median(fresh).toFixed(0)} ms`);
console.log(`  all-pass board (nothing to explain): ${median(pass).toFixed(2)} ms`);
console.log(`  one whole-chain evaluation: ${median(evals).toFixed(3)} ms → diagnose ≈ ${(t / median(evals)).toFixed(0)} evaluations`);
