// Review benchmark: `batch --json` over a synthetic log of 10,000 boards × 60
// checks (goal: under 1 s) and the history screen's data load of one board
// (goal: under 100 ms). Boards, serials and values are invented. Board 1 goes
// through the real store; the other 9,999 are written straight into
// `boards/<serial>.json` in the store's format, then the index is rebuilt once
// by the store (the long scan, with progress).
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Target } from '../src/analysis/types.js';
import { uncertaintyFor, verdictFor } from '../src/analysis/verdict.js';
import { batchCommand } from '../src/cli/batch.js';
import { toLogJson } from '../src/log/json-text.js';
import { openLog } from '../src/log/store.js';
import { boardSchemaVersion, type BoardFile, type Reading } from '../src/log/types.js';
import { loadPlanText } from '../src/plan/load.js';
import { computeTargets } from '../src/analysis/targets.js';
import { TargetsCache } from '../src/log/targets-cache.js';
import { planBandSource } from '../src/ui/batch/plan-bands.js';
import { loadHistory } from '../src/ui/history/load-history.js';
import { reportGoal } from './goals.js';
import { benchPlan } from './review-plan.js';

const boards = Number(process.env.BENCH_BOARDS ?? 10_000);
const checksPerBoard = 60;
const root = join(tmpdir(), 'probebook-review-bench');
// The synthetic log is kept under bench/out/ (git-ignored) and reused by later runs;
// BENCH_FRESH=1 writes it again.
const kept = join(import.meta.dirname, 'out', `review-log-${boards}`);
const dir = kept;
const isReused = existsSync(join(kept, 'complete')) && !process.env.BENCH_FRESH;
if (!isReused) rmSync(kept, { recursive: true, force: true });
const cacheDir = join(root, 'cache');
/** A fresh cache object over the bench's cache folder (as a new process would open it). */
const diskCache = () => new TargetsCache({ dir: cacheDir, compute: computeTargets });
rmSync(root, { recursive: true, force: true });
mkdirSync(root, { recursive: true });
process.env.PROBEBOOK_CACHE = cacheDir;

const ms = (t0: number) => performance.now() - t0;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? NaN;
const fmt = (x: number) => `${x.toFixed(x < 10 ? 2 : 0)} ms`;
// A small seeded generator (LCG, Numerical Recipes constants) so every run writes the same log.
let seed = 12345;
const rand = () => (seed = (seed * 1664525 + 1013904223) >>> 0) / 2 ** 32;
const gauss = () => Math.sqrt(-2 * Math.log(rand() + 1e-12)) * Math.cos(2 * Math.PI * rand());

const log = await openLog(dir);
const planText = `${JSON.stringify(benchPlan, null, 2)}\n`;
const plan = loadPlanText(planText, 'bench-review.plan.json');

let t0 = performance.now();
const bands = await planBandSource(log, diskCache()).load([]);
void bands;
const targets: Target[] = [];
function valueFor(t: Target): number {
  const lo = Number.isFinite(t.worst.min) ? t.worst.min : t.nominal;
  const hi = Number.isFinite(t.worst.max) ? t.worst.max : t.nominal * 10;
  const centre = Number.isFinite(t.worst.max) && Number.isFinite(t.worst.min) ? t.nominal : (lo + hi) / 2;
  return centre + gauss() * ((hi - lo) / 7);
}
function verdictOf(t: Target, value: number) {
  return verdictFor(t, value, uncertaintyFor(plan, t.check, t.unit)).verdict;
}

if (!isReused) {
  // Board 1 through the store: run, 60 durable readings, end (also saves the plan snapshot).
  {
    const first = await log.startRun('BR-00001', { plan: plan.plan, planHash: plan.hash, planText, operator: 'bench' });
    t0 = performance.now();
    const set = await planBandSource(log, diskCache()).get(plan.hash);
    const coldTargets = ms(t0);
    console.log(`targets of the ${set?.order.length}-check plan, first time (Monte Carlo, then cached): ${fmt(coldTargets)}`);
    targets.push(...computeTargets(plan).targets.slice(0, checksPerBoard));
    t0 = performance.now();
    for (const t of targets) {
      const value = valueFor(t);
      await log.appendReading('BR-00001', {
        run: first.id,
        check: t.check,
        value,
        unit: t.unit,
        raw: String(value),
        operator: 'bench',
        verdict: verdictOf(t, value),
        planHash: plan.hash,
      });
    }
    await log.endRun('BR-00001', first.id, 'passed');
    console.log(`store: ${checksPerBoard} durable readings on one board: ${fmt(ms(t0))} (${fmt(ms(t0) / checksPerBoard)} each)`);
  }

  // Boards 2…N written directly, a day of bench time spread over them; one in 20 reworked and re-run.
  t0 = performance.now();
  const start0 = Date.UTC(2026, 9, 1);
  for (let b = 2; b <= boards; b++) {
    const serial = `BR-${String(b).padStart(5, '0')}`;
    const at = (k: number) => new Date(start0 + b * 60_000 + k * 500).toISOString();
    const runs = [{ id: `u-${b}-1`, started: at(0), ended: at(100), operator: 'bench', outcome: 'passed' as const, plan: plan.plan, planHash: plan.hash }];
    const readings: Reading[] = targets.map((t, i) => {
      const value = valueFor(t);
      return {
        id: `r-${b}-${i}`,
        run: runs[0]?.id ?? '',
        check: t.check,
        value,
        unit: t.unit,
        raw: String(value),
        at: at(i + 1),
        operator: 'bench',
        verdict: verdictOf(t, value),
        planHash: plan.hash,
      };
    });
    const rework = [];
    if (b % 20 === 0) {
      rework.push({ id: `w-${b}`, at: at(101), run: null, part: 'osc.Ct', from: '8n2', to: '10n', note: 'invented rework', operator: 'bench' });
      runs.push({ id: `u-${b}-2`, started: at(102), ended: at(110), operator: 'bench', outcome: 'passed', plan: plan.plan, planHash: plan.hash });
      const t = targets[5];
      if (t)
        readings.push({
          id: `r-${b}-x`,
          run: `u-${b}-2`,
          check: t.check,
          value: t.nominal,
          unit: t.unit,
          raw: String(t.nominal),
          at: at(103),
          operator: 'bench',
          verdict: 'pass',
          planHash: plan.hash,
        });
    }
    const board: BoardFile = { schemaVersion: boardSchemaVersion, serial, plan: plan.plan, runs, readings, rework, captures: [] };
    writeFileSync(join(dir, 'boards', `${serial}.json`), `${toLogJson(board, 1)}\n`);
  }
  console.log(`wrote ${boards - 1} board files directly: ${fmt(ms(t0))}`);

  t0 = performance.now();
  let lastShown = 0;
  await log.readIndex((done, total) => {
    if (done - lastShown >= total / 4 || done === total) {
      lastShown = done;
      console.log(`  index rebuild: ${done} of ${total} board files`);
    }
  });
  console.log(`index rebuild (the long scan, once): ${fmt(ms(t0))}`);
  writeFileSync(join(dir, 'complete'), '');
} else {
  console.log(`reusing the synthetic log in ${dir} (BENCH_FRESH=1 writes it again)`);
  await planBandSource(log, diskCache()).get(plan.hash);
}

const io = (sink: { out: string }) => ({
  stdout: (t: string) => void (sink.out += t),
  stderr: () => {},
  env: { PROBEBOOK_CACHE: cacheDir },
  cwd: process.cwd(),
});
const inProcess: number[] = [];
let size = 0;
for (let i = 0; i < 3; i++) {
  const sink = { out: '' };
  t0 = performance.now();
  await batchCommand(['--json', '--log', dir], io(sink));
  inProcess.push(ms(t0));
  size = sink.out.length;
}
console.log(
  `batch --json in process (${boards} boards × ${checksPerBoard} checks, ${(size / 1024).toFixed(0)} KiB out): median ${fmt(median(inProcess))} of ${inProcess.map((x) => x.toFixed(0)).join(', ')} ms`,
);

{
  // Where the in-process time goes, step by step.
  const { batchFigures, revisionsOf } = await import('../src/review/batch.js');
  const { batchJson } = await import('../src/review/batch-json.js');
  let t = performance.now();
  await (await openLog(dir)).readIndex();
  const tQuick = ms(t);
  t = performance.now();
  const fresh = await openLog(dir);
  // As `batch` reads it: every board file's stamp checked (one stat each).
  const index = await fresh.readIndex(undefined, { verify: true });
  const tIndex = ms(t);
  t = performance.now();
  const source = planBandSource(fresh, diskCache());
  const snaps = await source.load(revisionsOf(index));
  const tBands = ms(t);
  // The per-check columns file is read on first use: time that apart.
  t = performance.now();
  const columns = index.checkColumns;
  const tChecks = ms(t);
  t = performance.now();
  const figures = batchFigures(index, snaps);
  const tFigures = ms(t);
  t = performance.now();
  JSON.stringify(batchJson(figures, 'all boards'));
  const tJson = ms(t);
  console.log(
    `  of which: read index with every board file verified ${fmt(tIndex)} (quick path without verifying: ${fmt(tQuick)}), per-check columns ${fmt(tChecks)} (${columns ? columns.latestValue.length : 0} rows), bands ${fmt(tBands)}, figures ${fmt(tFigures)}, JSON ${fmt(tJson)}`,
  );
  const total = tIndex + tChecks + tBands + tFigures + tJson;
  console.log(
    `  shares: index ${(tIndex / total).toFixed(2)}, per-check columns ${(tChecks / total).toFixed(2)}, figures ${(tFigures / total).toFixed(2)}, bands+JSON ${((tBands + tJson) / total).toFixed(2)}`,
  );
}
// The command as users run it: scripts/build.mjs's split bundle (React and Ink stay in a chunk `batch` never loads).
spawnSync(process.execPath, ['scripts/build.mjs'], { cwd: join(import.meta.dirname, '..'), stdio: 'inherit' });
const bundle = join(import.meta.dirname, '..', 'dist', 'probebook.js');
const asProcess: number[] = [];
for (let i = 0; i < 3; i++) {
  t0 = performance.now();
  const r = spawnSync(process.execPath, [bundle, 'batch', '--json', '--log', dir], { env: { ...process.env, PROBEBOOK_CACHE: cacheDir }, maxBuffer: 1 << 28 });
  asProcess.push(ms(t0));
  if (r.status !== 0) console.log(`  batch exited ${r.status}: ${String(r.stderr).split('\n')[0]}`);
}
const startup: number[] = [];
for (let i = 0; i < 3; i++) {
  t0 = performance.now();
  spawnSync(process.execPath, [bundle, '--help']);
  startup.push(ms(t0));
}
console.log(`batch --json as a process (bundled): median ${fmt(median(asProcess))}; node start + --help alone ${fmt(median(startup))}`);

const history: number[] = [];
for (let i = 0; i < 20; i++) {
  t0 = performance.now();
  await loadHistory(log, 'BR-00040', planBandSource(log, diskCache()));
  history.push(ms(t0));
}
console.log(`history screen data load of one board (board file + plan snapshot bands): median ${fmt(median(history))}`);

const bare: number[] = [];
for (let i = 0; i < 3; i++) {
  t0 = performance.now();
  spawnSync(process.execPath, ['-e', '0']);
  bare.push(ms(t0));
}
const batchGoal = 1000;
const historyGoal = 100;
const row = (work: string, today: string, figure: number, goal: number) =>
  console.log(
    `${work.padEnd(46)}${today.padStart(10)}${fmt(figure).padStart(11)}${`≤ ${goal} ms`.padStart(11)}${(figure / goal).toFixed(2).padStart(8)}${`${(figure / median(bare)).toFixed(1)}×`.padStart(9)}`,
  );
console.log(
  `\n${'work'.padEnd(46)}${'today'.padStart(10)}${'now'.padStart(11)}${'goal'.padStart(11)}${'÷goal'.padStart(8)}${'÷node'.padStart(9)}   (node -e 0: ${fmt(median(bare))}; ÷goal below 1 meets it)`,
);
row(`batch --json, ${boards} boards × ${checksPerBoard}, process`, '3300 ms', median(asProcess), batchGoal);
row(`batch --json, ${boards} boards × ${checksPerBoard}, in process`, '—', median(inProcess), batchGoal);
row('history data load of one board', '—', median(history), historyGoal);
reportGoal(
  'batch',
  boards === 10_000 ? median(asProcess) : Number.NaN,
  boards === 10_000 ? 'as a process, bundled' : `BENCH_BOARDS=${boards}: the goal is at 10,000 boards`,
);
rmSync(root, { recursive: true, force: true });
