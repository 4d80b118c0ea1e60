// The TUI's speed goals (issue 4), measured, never asserted:
//  1. keystroke to frame on the bring-up screen, a 40-check plan, a 10,000-board
//     log: median under 16 ms;
//  2. command start to first frame of the bundle in a real terminal (tmux):
//     under 400 ms, with bare `node` start in the same terminal as the yardstick.
// The 10,000-board log is made once under bench/out/ (git-ignored) by writing
// board files directly, then indexed by the real store; board data is invented.
import { spawnSync } from 'node:child_process';
import { EventEmitter } from 'node:events';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { build } from 'esbuild';
import { openLog } from '../src/log/store.js';
import { boardSchemaVersion, type BoardFile } from '../src/log/types.js';
import { loadPlanText } from '../src/plan/load.js';

const root = resolve(import.meta.dirname, '..');
const out = join(root, 'bench', 'out');
const boardsWanted = 10_000;

const median = (xs: readonly number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? (s[m] ?? NaN) : ((s[m - 1] ?? NaN) + (s[m] ?? NaN)) / 2;
};
const pct = (xs: readonly number[], p: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(p * xs.length))] ?? NaN;
const ms = (x: number) => `${x.toFixed(1)} ms`;

// ---- a 40-check plan (invented): rails, an oscillator, a gain stage, and hand-written checks

const manualChecks = Array.from({ length: 26 }, (_, i) => ({
  id: `tp${i + 1}`,
  quantity: 'DC level',
  unit: 'V',
  nominal: `${(1 + i * 0.25).toFixed(2)} V`,
  tol: '2%',
}));
const planText = JSON.stringify({
  plan: 'bench-40',
  title: 'Benchmark board, 40 checks (invented)',
  note: 'Invented benchmark board; values are illustrative, not from any product.',
  rails: [
    { id: '+12V', nominal: '12 V', tol: '3%' },
    { id: '-12V', nominal: '-12 V', tol: '3%' },
  ],
  idleCurrent: { max: '40 mA' },
  uncertainty: { V: '0.5% + 2 mV', A: '1% + 0.1 mA', Hz: '0.01%', ohm: '1% + 1 ohm' },
  stages: [
    {
      id: 'osc',
      kind: 'schmitt-integrator',
      parts: { R1: '10k 1%', R2: '22k 1%', Rt: '4k7 1%', Ct: '47n 5%' },
      testPoints: { square: 'TP1', triangle: 'TP2' },
    },
    { id: 'amp', kind: 'inverting-amp', input: 'osc.triangle', parts: { Rin: '10k 1%', Rf: '15k 1%' }, testPoints: { out: 'TP3' } },
    { id: 'misc', kind: 'manual', checks: manualChecks },
  ],
});
const plan = loadPlanText(planText, 'bench-40.plan.json');

// ---- the 10,000-board log

async function bigLog() {
  const dir = join(out, `ui-log-${boardsWanted}`);
  const log = await openLog(dir);
  const marker = join(dir, 'complete');
  if (!existsSync(marker)) {
    console.log(`writing ${boardsWanted} invented board files to ${dir} (once) …`);
    const run = await log.startRun('BENCH-00000', { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator: 'bench' });
    const at = new Date(Date.UTC(2026, 10, 2, 8)).toISOString();
    mkdirSync(join(dir, 'boards'), { recursive: true });
    for (let i = 1; i < boardsWanted; i++) {
      const serial = `BENCH-${String(i).padStart(5, '0')}`;
      const runId = `u-bench-${i}`;
      const board: BoardFile = {
        schemaVersion: boardSchemaVersion,
        serial,
        plan: plan.plan,
        runs: [{ id: runId, started: at, ended: at, operator: 'bench', outcome: 'passed', plan: plan.plan, planHash: plan.hash }],
        readings: manualChecks.slice(0, 6).map((c, k) => ({
          id: `r-bench-${i}-${k}`,
          run: runId,
          check: `misc.${c.id}`,
          value: 1 + k * 0.25,
          unit: 'V',
          raw: (1 + k * 0.25).toFixed(2),
          at,
          operator: 'bench',
          verdict: 'pass',
          planHash: plan.hash,
        })),
        rework: [],
        captures: [],
      };
      writeFileSync(join(dir, 'boards', `${serial}.json`), `${JSON.stringify(board)}\n`);
    }
    void run;
    const t0 = performance.now();
    const index = await log.readIndex();
    console.log(`index rebuilt over ${Object.keys(index.boards).length} boards in ${ms(performance.now() - t0)}`);
    writeFileSync(marker, '');
  }
  const t0 = performance.now();
  const index = await log.readIndex();
  console.log(`index read (${Object.keys(index.boards).length} boards): ${ms(performance.now() - t0)}`);
  return { log, dir };
}

// ---- 1. keystroke to frame

class FakeStdout extends EventEmitter {
  columns = 80;
  rows = 24;
  isTTY = true;
  writes = 0;
  write = () => {
    this.writes++;
    return true;
  };
}
class FakeStdin extends EventEmitter {
  isTTY = true;
  data: string | null = null;
  setEncoding() {}
  setRawMode() {}
  resume() {}
  pause() {}
  ref() {}
  unref() {}
  read = () => {
    const d = this.data;
    this.data = null;
    return d;
  };
  send(text: string) {
    this.data = text;
    this.emit('readable');
    this.emit('data', text);
  }
}

const sleep = (t: number) => new Promise((r) => setTimeout(r, t));

/**
 * The app as users run it: one production bundle (React without its development
 * checks, which tsx would load), built like scripts/build.mjs into bench/out/.
 */
async function productionApp() {
  const outfile = join(out, 'ui-app.mjs');
  await build({
    stdin: {
      contents:
        "export { App } from './src/ui/app.tsx'; export { PlanCatalog } from './src/ui/bench/plan-catalog.ts'; export { render } from 'ink'; export { createElement } from 'react';",
      resolveDir: root,
      loader: 'ts',
    },
    outfile,
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'esm',
    jsx: 'automatic',
    define: { 'process.env.NODE_ENV': '"production"', fetch: 'undefined' },
    plugins: [
      {
        name: 'no-devtools',
        setup(b) {
          b.onResolve({ filter: /^react-devtools-core$/ }, () => ({ path: 'stub', namespace: 'stub' }));
          b.onLoad({ filter: /.*/, namespace: 'stub' }, () => ({ contents: 'throw new Error("not bundled")', loader: 'js' }));
        },
      },
    ],
    banner: { js: "import { createRequire as __r } from 'node:module'; const require = __r(import.meta.url);" },
    logLevel: 'warning',
  });
  return (await import(pathToFileURL(outfile).href)) as typeof import('../src/ui/app.js') &
    typeof import('../src/ui/bench/plan-catalog.js') & { render: typeof import('ink').render; createElement: typeof import('react').createElement };
}

async function keystrokeToFrame(log: Awaited<ReturnType<typeof bigLog>>['log']) {
  const { App, PlanCatalog, render, createElement } = await productionApp();
  const catalog = new PlanCatalog(log, [plan]);
  const t0 = performance.now();
  const targets = catalog.targets(plan);
  console.log(`targets of the ${targets.targets.length}-check plan (10,000 trials): ${ms(performance.now() - t0)}`);
  const stdout = new FakeStdout();
  const stdin = new FakeStdin();
  const app = render(
    createElement(App, {
      log,
      catalog,
      operator: 'bench',
      size: { width: 80, height: 23 },
      initialRoute: { screen: 'bring-up', serial: 'BENCH-00000', planHash: plan.hash },
    }),
    { stdout: stdout as unknown as NodeJS.WriteStream, stdin: stdin as unknown as NodeJS.ReadStream, exitOnCtrlC: false, patchConsole: false },
  );
  await sleep(500);
  stdin.send('\r'); // acknowledge the cautions
  await sleep(200);
  // Keys a technician presses: digits into the input line and Backspace, Tab to the
  // stage list, moves there, Tab back.
  const sequence = ['1', '2', '\u007F', '\u007F', '\t', 'j', 'j', 'k', '\t', '5', '\u007F'];
  const times: number[] = [];
  for (let round = 0; round < 12; round++) {
    for (const key of sequence) {
      const before = stdout.writes;
      const start = performance.now();
      stdin.send(key);
      while (stdout.writes === before && performance.now() - start < 500) await new Promise((r) => setImmediate(r));
      times.push(performance.now() - start);
      // Past Ink's 30 fps throttle window, so every key gets its own leading-edge frame.
      await sleep(40);
    }
  }
  app.unmount();
  return times;
}

// ---- 2. command start to first frame, in tmux

function tmuxFirstFrame(command: string, marker: string, label: string, runs = 5) {
  const firsts: number[] = [];
  for (let i = 0; i < runs; i++) {
    const session = `probebook-bench-${process.pid}-${i}`;
    const start = performance.now();
    spawnSync('tmux', ['new-session', '-d', '-s', session, '-x', '80', '-y', '24', `${command}; sleep 30`]);
    let seen = NaN;
    while (performance.now() - start < 15_000) {
      const text = spawnSync('tmux', ['capture-pane', '-p', '-t', session], { encoding: 'utf8' }).stdout;
      if (text.includes(marker)) {
        seen = performance.now() - start;
        break;
      }
    }
    spawnSync('tmux', ['kill-session', '-t', session]);
    firsts.push(seen);
  }
  console.log(`${label}: median ${ms(median(firsts))} (runs: ${firsts.map((x) => x.toFixed(0)).join(', ')} ms)`);
  return median(firsts);
}

// ---- run

const { log, dir } = await bigLog();
const keyTimes = await keystrokeToFrame(log);
console.log(
  `keystroke to frame, bring-up screen, 40 checks, ${boardsWanted}-board log: median ${ms(median(keyTimes))}, p95 ${ms(pct(keyTimes, 0.95))}, max ${ms(Math.max(...keyTimes))} over ${keyTimes.length} keys (goal: median < 16 ms)`,
);

// `npm run bench ui -- ` runs everything; PROBEBOOK_BENCH_KEYS_ONLY=1 stops here (for profiling).
if (process.env.PROBEBOOK_BENCH_KEYS_ONLY) process.exit(0);
if (!existsSync(join(root, 'dist', 'probebook.js'))) spawnSync(process.execPath, ['scripts/build.mjs'], { cwd: root, stdio: 'inherit' });
const node = process.execPath;
const bare = tmuxFirstFrame(`'${node}' -e "console.log('probebook · bench')"`, 'probebook · bench', 'bare node start to its first line (yardstick)');
const demoPlans = `--plan '${join(root, 'demo/exciter.plan.json')}' --plan '${join(root, 'demo/line-driver.plan.json')}'`;
const small = join(out, 'ui-empty-log');
const first = tmuxFirstFrame(
  `'${node}' '${join(root, 'dist/probebook.js')}' --log '${small}' ${demoPlans}`,
  'probebook · bench',
  'bundle start to first frame (empty log)',
);
const big = tmuxFirstFrame(
  `'${node}' '${join(root, 'dist/probebook.js')}' --log '${dir}' ${demoPlans}`,
  'BENCH-',
  `bundle start to the board list (${boardsWanted}-board log)`,
);
console.log(`ratios to bare node: first frame ${(first / bare).toFixed(2)}×, board list of ${boardsWanted} ${(big / bare).toFixed(2)}×`);
// Issue 15's goals beside today's figures (measured on a quiet machine before the work began).
const keyP95 = pct(keyTimes, 0.95);
const goalRow = (work: string, today: string, figure: number, goal: number) =>
  console.log(
    `${work.padEnd(44)}${today.padStart(9)}${ms(figure).padStart(11)}${`≤ ${goal} ms`.padStart(10)}${(figure / goal).toFixed(2).padStart(7)}${`${(figure / bare).toFixed(2)}×`.padStart(8)}`,
  );
console.log(
  `\n${'work'.padEnd(44)}${'today'.padStart(9)}${'now'.padStart(11)}${'goal'.padStart(10)}${'÷goal'.padStart(7)}${'÷node'.padStart(8)}   (bare node in tmux: ${ms(bare)}; ÷goal below 1 meets it)`,
);
goalRow('TUI first frame, empty log', '550 ms', first, 300);
goalRow(`TUI board list, ${boardsWanted} boards`, '965 ms', big, 400);
goalRow(`keystroke to frame p95, bring-up, 40 checks`, '17.9 ms', keyP95, 16);
// Issue 15's goal rows for the summary table of `npm run bench` (bench/goals.ts).
const { reportGoal } = await import('./goals.js');
reportGoal('tui-first-frame-empty', first);
reportGoal('tui-first-frame-10k', big);
reportGoal('keystroke-p95', keyP95, `median ${ms(median(keyTimes))} over ${keyTimes.length} keys`);
