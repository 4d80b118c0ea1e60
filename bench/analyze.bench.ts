// `npm run bench analyze`: end-to-end `probebook analyze --json` on 1 M- and
// 5 M-sample CSV captures, through the shipped command (dist/probebook.js, as
// scripts/build.mjs builds it, code splitting and all), beside (a) the time to
// merely read the file's bytes, (b) a bare `node -e 0` (the floor of any Node
// process, in time and in memory) and (c) a numpy reference
// (bench/analyze_reference.py: np.loadtxt plus numpy.fft) measuring the same
// file in the same run. Reported as paired ratios per round (median of the
// rounds), with peak RSS over file size.
// Goal (issue 15): probebook ≤ 0.5× numpy at both sizes, peak RSS ≤ 2× the file
// size. Without python3 or numpy the bench says so and shows probebook's own
// figures only. BENCH_BASELINE=/path/to/an/older/dist/probebook.js adds that
// command's row, measured in the same rounds, for a before/after in one run. The captures are invented: a shaped sine with noise, written here.
// After the table, what each figure is made of (node start, the command's fixed cost, read+parse on one and on two threads, measure, output).
import { spawnSync } from 'node:child_process';
import { build } from 'esbuild';
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, statSync, writeSync } from 'node:fs';
import { join } from 'node:path';

const out = join('bench', 'out');
mkdirSync(out, { recursive: true });
const sizes = [1_000_000, 5_000_000];
const rounds = Number(process.env.BENCH_ROUNDS ?? 3);

function makeCapture(n: number): string {
  const file = join(out, `capture-${n}.csv`);
  if (existsSync(file)) return file;
  console.log(`writing ${file} …`);
  const fd = openSync(file, 'w');
  writeSync(fd, 'Time (s),CH1 (V)\n');
  const fs = 1e6;
  const f = 1372.4;
  let seed = 12345;
  const lines: string[] = [];
  for (let i = 0; i < n; i++) {
    seed = (seed * 16807) % 2147483647;
    const t = i / fs;
    const v = 3.1 * Math.tanh(1.5 * Math.sin(2 * Math.PI * f * t)) + (seed / 2147483647 - 0.5) * 0.01;
    lines.push(`${t.toExponential(9)},${v.toFixed(6)}`);
    if (lines.length === 100_000) {
      writeSync(fd, `${lines.join('\n')}\n`);
      lines.length = 0;
    }
  }
  if (lines.length) writeSync(fd, `${lines.join('\n')}\n`);
  closeSync(fd);
  return file;
}

// Time and peak RSS of a child, taken by a tiny Python harness (getrusage of
// its children), so both contenders are measured the same way.
const harness = `
import json, resource, subprocess, sys, time
t0 = time.perf_counter()
r = subprocess.run(sys.argv[1:], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
t = time.perf_counter() - t0
u = resource.getrusage(resource.RUSAGE_CHILDREN)
print(json.dumps({"seconds": t, "cpu": u.ru_utime + u.ru_stime, "rssKb": u.ru_maxrss, "status": r.returncode, "out": r.stdout.decode(), "err": r.stderr.decode()[-300:]}))
`;

interface Timed {
  readonly seconds: number;
  /** User + system CPU time of the child, s: steadier than wall time on a busy machine. */
  readonly cpu: number;
  readonly rssKb: number;
  readonly out: string;
}

function timed(cmd: string[]): Timed {
  const r = spawnSync('python3', ['-c', harness, ...cmd], { encoding: 'utf8', maxBuffer: 1 << 24 });
  const result = JSON.parse(r.stdout) as Timed & { status: number; err: string };
  if (result.status !== 0) throw new Error(`${cmd.join(' ')} failed: ${result.err}`);
  return result;
}

function readBytes(file: string): number {
  const t0 = performance.now();
  const bytes = readFileSync(file);
  const t = performance.now() - t0;
  if (bytes.length === 0) throw new Error('empty');
  return t / 1000;
}

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? (s[m] ?? 0) : ((s[m - 1] ?? 0) + (s[m] ?? 0)) / 2;
};

const bundle = join('dist', 'probebook.js');
const built = spawnSync(process.execPath, [join('scripts', 'build.mjs')], { stdio: 'inherit' });
if (built.status !== 0) throw new Error('the command did not build (node scripts/build.mjs)');

const python = spawnSync('python3', ['-c', 'import sys; print(sys.version.split()[0])'], { encoding: 'utf8' });
if (python.status !== 0) {
  console.log('python3 is not installed: the timing harness and the numpy reference cannot run (benchmark only; tests do not need it)');
  process.exit(0);
}
const numpy = spawnSync('python3', ['-c', 'import numpy; print(numpy.__version__)'], { encoding: 'utf8' });
const hasNumpy = numpy.status === 0;
if (!hasNumpy) console.log('REFERENCE UNAVAILABLE: numpy is not installed for python3 (pip install numpy); probebook figures only, no ratios to numpy');
console.log(`node ${process.version}, python ${python.stdout.trim()}, numpy ${hasNumpy ? numpy.stdout.trim() : 'unavailable'}, ${rounds} rounds, medians`);
const bare = timed([process.execPath, '-e', '0']);
console.log(`node -e 0: ${bare.seconds.toFixed(3)} s, peak RSS ${(bare.rssKb / 1024).toFixed(1)} MB (the floor under any figure below)`);
const na = 'n/a';
const baseline = process.env.BENCH_BASELINE;
const contenders: { label: string; command: string }[] = [{ label: '', command: bundle }, ...(baseline ? [{ label: ' (baseline)', command: baseline }] : [])];
const rows: string[][] = [
  [
    'samples',
    'file MB',
    'read bytes s',
    'probebook s',
    'numpy s',
    'pb/numpy',
    'pb/read',
    'CPU pb/np',
    'pb RSS MB',
    'pb RSS/file',
    'node -e 0 RSS/file',
    'np RSS/file',
  ],
];
for (const n of sizes) {
  const file = makeCapture(n);
  const size = statSync(file).size;
  const read: number[] = [];
  const np: Timed[] = [];
  const pb: Timed[][] = contenders.map(() => []);
  for (let r = 0; r < rounds; r++) {
    read.push(readBytes(file));
    for (const [i, c] of contenders.entries()) pb[i]?.push(timed([process.execPath, c.command, 'analyze', file, '--json']));
    if (hasNumpy) np.push(timed(['python3', join('bench', 'analyze_reference.py'), file]));
  }
  const ours = JSON.parse(pb[0]?.[0]?.out ?? '{}') as Record<string, number>;
  if (hasNumpy) {
    const theirs = JSON.parse(np[0]?.out ?? '{}') as Record<string, number>;
    console.log(
      `${n} samples: frequency ${ours.frequency?.toFixed(4)} vs ${theirs.frequency?.toFixed(4)} Hz, THD ${ours.thd?.toFixed(5)} vs ${theirs.thd?.toFixed(5)}, Vrms ${ours.vrms?.toFixed(5)} vs ${theirs.vrms?.toFixed(5)}`,
    );
  } else console.log(`${n} samples: frequency ${ours.frequency?.toFixed(4)} Hz, THD ${ours.thd?.toFixed(5)}, Vrms ${ours.vrms?.toFixed(5)}`);
  contenders.forEach((c, i) => {
    const runs = pb[i] ?? [];
    // Paired per round: this command against numpy's run of the same round.
    const ratios = runs.map((t, r) => t.seconds / (np[r]?.seconds ?? Number.NaN));
    const cpuRatios = runs.map((t, r) => t.cpu / (np[r]?.cpu ?? Number.NaN));
    const pbS = median(runs.map((t) => t.seconds));
    const pbRss = Math.max(...runs.map((t) => t.rssKb)) * 1024;
    rows.push([
      `${n}${c.label}`,
      (size / 1e6).toFixed(1),
      median(read).toFixed(3),
      pbS.toFixed(3),
      hasNumpy ? median(np.map((t) => t.seconds)).toFixed(3) : na,
      hasNumpy ? `${median(ratios).toFixed(2)}×` : na,
      `${(pbS / median(read)).toFixed(1)}×`,
      hasNumpy ? `${median(cpuRatios).toFixed(2)}×` : na,
      (pbRss / 1e6).toFixed(1),
      `${(pbRss / size).toFixed(2)}×`,
      `${((bare.rssKb * 1024) / size).toFixed(2)}×`,
      hasNumpy ? `${((Math.max(...np.map((t) => t.rssKb)) * 1024) / size).toFixed(2)}×` : na,
    ]);
  });
}
const widths = rows[0]?.map((_, c) => Math.max(...rows.map((r) => (r[c] ?? '').length))) ?? [];
for (const r of rows) console.log(r.map((cell, c) => cell.padStart(widths[c] ?? 0)).join('  '));

// What each figure is made of, medians over the rounds, each part in a fresh
// process: node's own start, the command's fixed cost (the shipped command on
// a small capture), then reading + parsing and measuring timed inside a
// one-shot process (bench/analyze-phases.ts, bundled as the command is, its
// worker beside it), with the read on one thread and on two (the command takes
// two from 48 MiB on, when the machine has an idle core).
const tiny = join('demo', 'captures', 'exciter-sine.csv');
const phaseDir = join(out, 'phases');
await build({
  entryPoints: { 'analyze-phases': join('bench', 'analyze-phases.ts'), 'csv-part-worker': join('src', 'signal', 'csv-part-worker.ts') },
  outdir: phaseDir,
  splitting: true,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  minify: true,
  logLevel: 'warning',
});
const phases = (file: string, threads: '1' | '2'): { readMs: number; measureMs: number; outputMs: number } => {
  const r = spawnSync(process.execPath, [join(phaseDir, 'analyze-phases.js'), file, threads], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`analyze-phases failed: ${r.stderr.slice(-300)}`);
  return JSON.parse(r.stdout) as { readMs: number; measureMs: number; outputMs: number };
};
const ms = (xs: number[]): string => `${median(xs).toFixed(0)} ms`;
for (const n of sizes) {
  const file = join(out, `capture-${n}.csv`);
  const start: number[] = [];
  const fixed: number[] = [];
  const whole: number[] = [];
  const one: { readMs: number; measureMs: number; outputMs: number }[] = [];
  const two: { readMs: number; measureMs: number; outputMs: number }[] = [];
  for (let r = 0; r < rounds; r++) {
    start.push(timed([process.execPath, '-e', '0']).seconds * 1000);
    fixed.push(timed([process.execPath, bundle, 'analyze', tiny, '--json']).seconds * 1000);
    whole.push(timed([process.execPath, bundle, 'analyze', file, '--json']).seconds * 1000);
    one.push(phases(file, '1'));
    two.push(phases(file, '2'));
  }
  console.log(
    `${n} samples, made of: node start ${ms(start)}; command load + a small capture ${ms(fixed)} (so ${(median(fixed) - median(start)).toFixed(0)} ms over node); ` +
      `read+parse ${ms(one.map((p) => p.readMs))} on one thread, ${ms(two.map((p) => p.readMs))} on two; measure ${ms(one.map((p) => p.measureMs))}; ` +
      `output ${ms(one.map((p) => p.outputMs))}; the whole command ${ms(whole)}`,
  );
}
console.log('start of this work (one run, same machine, 1 M / 5 M): pb/numpy 0.76× / 0.62×, pb RSS/file 2.75× / 0.82×');
console.log('before (issue 15, 1 M / 5 M): pb/numpy 0.75× / 0.49×, pb RSS/file 3.01× at 1 M');
console.log('goal: pb/numpy ≤ 0.50× at both sizes; pb RSS/file ≤ 2×. Ratios are paired per round (same file, back to back).');
// Issue 15's goal rows for the summary table of `npm run bench` (bench/goals.ts): the pb/numpy and pb RSS/file cells.
const { reportGoal } = await import('./goals.js');
const cell = (n: number, column: number) => Number.parseFloat(rows.find((r) => r[0] === String(n))?.[column] ?? 'NaN');
reportGoal('analyze-1m', cell(1_000_000, 5), hasNumpy ? '' : 'numpy is not installed');
reportGoal('analyze-5m', cell(5_000_000, 5), hasNumpy ? '' : 'numpy is not installed');
reportGoal('analyze-rss', Math.max(cell(1_000_000, 9), cell(5_000_000, 9)));
