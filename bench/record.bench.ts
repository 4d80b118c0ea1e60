// `probebook record` as a technician runs it: one process per reading, through
// the bundle. Issue 15's goal is ≤ 3× a bare `node -e 0` on the same machine, so
// the figure that matters is the ratio in one run (machines are noisy). Also
// shown: the same command when the targets cache is empty (the Monte Carlo runs
// in the process), the cost the cache saves on every later reading.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { reportGoal } from './goals.js';

const root = join(import.meta.dirname, '..');
const node = process.execPath;
const bundle = join(root, 'dist', 'probebook.js');
const plan = join(root, 'demo', 'exciter.plan.json');
const rounds = 15;

const build = spawnSync(node, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });
if (build.status !== 0) throw new Error('the bundle did not build');

const work = mkdtempSync(join(tmpdir(), 'probebook-record-bench-'));
const log = join(work, 'log');
const cache = join(work, 'cache');

function timed(args: readonly string[]): number {
  const t0 = performance.now();
  const r = spawnSync(node, args, { encoding: 'utf8' });
  const ms = performance.now() - t0;
  if (r.status !== 0) throw new Error(`${args.join(' ')} exited ${r.status}: ${r.stderr}`);
  return ms;
}

const record = (board: string, cacheDir: string) => [
  bundle,
  'record',
  '--plan',
  plan,
  '--board',
  board,
  '--check',
  'rails.idle-current',
  '--value',
  '20 mA',
  '--log',
  log,
  '--cache',
  cacheDir,
];
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? Number.NaN;

// Fill the cache once (and warm the page cache for node and the bundle).
timed(record('WARM-1', cache));
const bare: number[] = [];
const warm: number[] = [];
const cold: number[] = [];
for (let i = 0; i < rounds; i++) {
  // Interleaved, so a burst of load on the machine hits every series alike.
  bare.push(timed(['-e', '0']));
  warm.push(timed(record(`B-${i}`, cache)));
  if (i < 5) {
    const empty = join(work, `empty-${i}`);
    cold.push(timed(record(`C-${i}`, empty)));
  }
}
rmSync(work, { recursive: true, force: true });

const f = (ms: number) => `${ms.toFixed(0)} ms`;
console.log(`node -e 0 (machine yardstick):                   median ${f(median(bare))}`);
console.log(`record, targets from the cache:                  median ${f(median(warm))}`);
console.log(`record, empty cache (Monte Carlo in the process): median ${f(median(cold))}`);
console.log(`ratio record / node -e 0:                        ${(median(warm) / median(bare)).toFixed(2)}×  (goal ≤ 3×)`);
console.log(`ratio empty cache / cached:                      ${(median(cold) / median(warm)).toFixed(2)}×`);
reportGoal('record', median(warm) / median(bare), `${f(median(warm))}; node -e 0 ${f(median(bare))}`);
