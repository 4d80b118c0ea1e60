// Tolerance engine speed goals (issue 15), measured, never asserted:
//  1. Monte Carlo of the demo exciter chain, 10,000 trials, in process: goal ≤ 100 ms;
//  2. the worst-case search of the same chain, in process: goal ≤ 100 ms;
//  3. `targets --json` with 10,000 trials and no cache, whole process (the bundle):
//     goal ≤ 4× a bare `node -e 0` measured in the same run (the command puts the
//     Monte Carlo in a worker only when the load average leaves a core free).
// In-process figures are this process's CPU time (user + system) so that other
// jobs on a shared machine weigh less; whole-process figures are wall time,
// interleaved with their yardstick so both see the same load. Medians.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { sampleChain } from '../src/analysis/sampling.js';
import { sensitivities } from '../src/analysis/sensitivity.js';
import { computeTargets } from '../src/analysis/targets.js';
import { worstCase } from '../src/analysis/worst-case.js';
import { buildChain, spreadOf } from '../src/plan/chain.js';
import { loadPlanFile } from '../src/plan/load.js';
import { upstreamOf } from '../src/plan/stages.js';

const root = resolve(import.meta.dirname, '..');
const rounds = 5;
const trials = 10_000;

const median = (xs: readonly number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? (s[m] ?? NaN) : ((s[m - 1] ?? NaN) + (s[m] ?? NaN)) / 2;
};
const cpu = (f: () => void): number => {
  const t0 = process.cpuUsage();
  f();
  const d = process.cpuUsage(t0);
  return (d.user + d.system) / 1000;
};
const wall = (cmd: string, args: readonly string[], env: NodeJS.ProcessEnv = process.env): number => {
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: ['ignore', 'ignore', 'pipe'] });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited ${r.status}: ${r.stderr.toString()}`);
  return performance.now() - t0;
};
const row = (what: string, figure: number, goal: string, ratio: string): string =>
  `${what.padEnd(58)} ${`${figure.toFixed(1)} ms`.padStart(10)}  goal ${goal.padEnd(16)} ${ratio}`;

const plan = await loadPlanFile(join(root, 'demo/exciter.plan.json'));
const chain = buildChain(plan);
const upstream = (id: string): readonly string[] => upstreamOf(plan.stages, id);
const perSigma = sensitivities(chain);

// Warm the JIT on every path once.
sampleChain(chain, { trials: 1000, seed: 1, distribution: 'normal' });
worstCase(chain, perSigma, { upstream });

const mc: number[] = [];
const wc: number[] = [];
const sens: number[] = [];
const full: number[] = [];
let evaluations = 0;
for (let r = 0; r < rounds; r++) {
  mc.push(cpu(() => sampleChain(chain, { trials, seed: r + 1, distribution: 'normal' })));
  wc.push(
    cpu(() => {
      evaluations = worstCase(chain, perSigma, { upstream }).evaluations;
    }),
  );
  sens.push(cpu(() => sensitivities(chain)));
  // A fresh plan object each round: computeTargets keeps its results per plan object.
  const again = await loadPlanFile(join(root, 'demo/exciter.plan.json'));
  full.push(cpu(() => computeTargets(again, { trials, seed: r + 1 })));
}

const varied = chain.variables.filter((v) => spreadOf(v) > 0).length;
console.log(
  `demo exciter: ${plan.stages.length} stages, ${varied} varied variables (parts, op-amp, defaults), ${chain.checks.length} checks; median of ${rounds}, CPU time`,
);
console.log(
  row(
    'Monte Carlo, 10,000 trials, in process',
    median(mc),
    '≤ 100 ms',
    `${(median(mc) / 100).toFixed(2)}× the goal; ${((median(mc) / trials) * 1000).toFixed(1)} µs per trial`,
  ),
);
console.log(row(`worst-case search (${evaluations} chain evaluations), in process`, median(wc), '≤ 100 ms', `${(median(wc) / 100).toFixed(2)}× the goal`));
console.log(row('sensitivities (two evaluations per variable)', median(sens), '(report)', ''));
console.log(
  row(
    'computeTargets (all of it), 10,000 trials',
    median(full),
    '(report)',
    `Monte Carlo ${((100 * median(mc)) / median(full)).toFixed(0)} %, worst case ${((100 * median(wc)) / median(full)).toFixed(0)} %`,
  ),
);

// Whole process: the bundle's `targets --json` against a bare node start, interleaved.
const bundle = join(root, 'dist/probebook.js');
if (!existsSync(bundle)) {
  console.log('targets --json, whole process: no dist/probebook.js; run `node scripts/build.mjs` first');
} else {
  const bare: number[] = [];
  const targets: number[] = [];
  // The same command kept on one thread, and with the Monte Carlo always in the worker (PROBEBOOK_THREADS).
  const one: number[] = [];
  const two: number[] = [];
  const run = (into: number[], threads?: string): void => {
    const cache = mkdtempSync(join(tmpdir(), 'probebook-bench-cache-'));
    try {
      const env = { ...process.env, PROBEBOOK_CACHE: cache, ...(threads ? { PROBEBOOK_THREADS: threads } : {}) };
      into.push(wall(process.execPath, [bundle, 'targets', 'demo/exciter.plan.json', '--json', '--trials', String(trials)], env));
    } finally {
      rmSync(cache, { recursive: true, force: true });
    }
  };
  for (let r = 0; r < rounds; r++) {
    bare.push(wall(process.execPath, ['-e', '0']));
    run(targets);
    run(one, '1');
    run(two, '2');
  }
  console.log(row('node -e 0 (yardstick), wall', median(bare), '', ''));
  console.log(
    row(
      'targets --json, 10,000 trials, no cache, whole process, wall',
      median(targets),
      '≤ 4× node -e 0',
      `${(median(targets) / median(bare)).toFixed(1)}× node -e 0`,
    ),
  );
  console.log(row('  the same on one thread (PROBEBOOK_THREADS=1)', median(one), '(report)', `${(median(one) / median(bare)).toFixed(1)}× node -e 0`));
  console.log(
    row(
      '  the same, Monte Carlo in the worker (PROBEBOOK_THREADS=2)',
      median(two),
      '(report)',
      `${(median(two) / median(bare)).toFixed(1)}× node -e 0; ${(median(two) / median(one)).toFixed(2)}× one thread (load average ${loadavg()[0]?.toFixed(1)} on ${availableParallelism()} cores)`,
    ),
  );
  (await import('./goals.js')).reportGoal('targets-process', median(targets) / median(bare), `${median(targets).toFixed(0)} ms`);
}
// Issue 15's goal rows for the summary table of `npm run bench` (bench/goals.ts).
const { reportGoal } = await import('./goals.js');
reportGoal('monte-carlo', median(mc));
reportGoal('worst-case', median(wc));
