// Bench log speed (issue 3): append latency (median and 99th percentile,
// including fsync) and `history` time with logs of 10, 1,000 and 10,000 boards
// × 60 readings, opening the index (the bench screen's first read), and a
// rebuild from the board files. The per-reading cost must stay flat as boards
// grow; for contrast, one JSON file holding every reading, rewritten per
// append. Figures and ratios from one run; nothing here fails a build.
// Usage: npm run bench -- log   (or: node --import tsx bench/log.bench.ts 10 1000)
import { closeSync, fsyncSync, mkdirSync, mkdtempSync, openSync, readFileSync, renameSync, rmSync, writeFileSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../src/cli/main.js';
import { sha256Hex } from '../src/log/content-store.js';
import { toLogJson } from '../src/log/json-text.js';
import { openLog } from '../src/log/store.js';
import { type BoardFile, boardSchemaVersion, type Reading } from '../src/log/types.js';

const sizes = process.argv
  .slice(2)
  .map(Number)
  .filter((n) => n > 0);
const boardCounts = sizes.length > 0 ? sizes : [10, 1000, 10_000];
const perBoard = 60;
const checks = 30; // 60 readings = every check read twice (before and after a rework)
const appends = 200;

// An invented plan text; the log keeps it verbatim and never evaluates it here.
const planText = '{"plan":"bench-board","title":"Invented board for the log benchmark"}\n';
const planHash = sha256Hex(planText);

function quantile(sorted: readonly number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? Number.NaN;
}
const ms = (x: number) => `${x.toFixed(x < 10 ? 2 : 1)} ms`;

/** Board files written straight to disk (no fsync): the fixture, not the thing measured. */
function makeBoards(dir: string, count: number): string[] {
  mkdirSync(join(dir, 'boards'), { recursive: true });
  mkdirSync(join(dir, 'plans'), { recursive: true });
  writeFileSync(join(dir, 'plans', `${planHash}.json`), planText);
  const serials: string[] = [];
  const t0 = Date.parse('2026-03-02T08:00:00.000Z');
  for (let b = 0; b < count; b++) {
    const serial = `BN-${String(b).padStart(5, '0')}`;
    const run = `u-bench${b.toString(36)}`;
    const readings: Reading[] = [];
    for (let i = 0; i < perBoard; i++) {
      const at = new Date(t0 + b * 3_600_000 + i * 30_000).toISOString();
      readings.push({
        id: `r-b${b.toString(36)}-${i}`,
        run,
        check: `stage${i % checks}.out.dc`,
        value: 1 + ((b * 7 + i) % 13) / 100,
        unit: 'V',
        raw: String(1 + i / 100),
        at,
        operator: 'bench',
        verdict: i % 17 === 0 ? 'fail' : 'pass',
        planHash,
      });
    }
    const board: BoardFile = {
      schemaVersion: boardSchemaVersion,
      serial,
      plan: 'bench-board',
      runs: [
        { id: run, started: new Date(t0 + b * 3_600_000).toISOString(), ended: null, operator: 'bench', outcome: 'in-progress', plan: 'bench-board', planHash },
      ],
      readings,
      rework: [],
      captures: [],
    };
    writeFileSync(join(dir, 'boards', `${serial}.json`), `${toLogJson(board, 1)}\n`);
    serials.push(serial);
  }
  return serials;
}

async function timeCommand(argv: string[]): Promise<number> {
  const t0 = performance.now();
  const status = await main(argv, { stdout: () => {}, stderr: (t) => process.stderr.write(t), env: {}, cwd: process.cwd() });
  if (status !== 0) throw new Error(`${argv.join(' ')} exited ${status}`);
  return performance.now() - t0;
}

interface Row {
  boards: number;
  rebuild: number;
  open: number;
  /** CPU time of the open (user + system): what the machine's load does not inflate. */
  openCpu: number;
  median: number;
  p99: number;
  /** CPU time per append. */
  appendCpu: number;
  /** The disk floor measured just before these appends. */
  floor: number;
  history: number;
  indexMb: number;
}
const rows: Row[] = [];

for (const count of boardCounts) {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-bench-'));
  try {
    const g0 = performance.now();
    const serials = makeBoards(dir, count);
    process.stdout.write(`${count} boards × ${perBoard} readings written in ${ms(performance.now() - g0)}\n`);

    const r0 = performance.now();
    let shown = 0;
    await (await openLog(dir)).readIndex((done, total) => {
      if (total >= 1000 && done - shown >= total / 4) {
        shown = done;
        process.stdout.write(`  rebuilding the index: ${done} of ${total}\n`);
      }
    });
    const rebuild = performance.now() - r0;
    const indexMb = readFileSync(join(dir, 'index.json')).length / 1e6;

    const log = await openLog(dir);
    const floorHere = rawReplace();
    const lat: number[] = [];
    const cpu0 = process.cpuUsage();
    for (let i = 0; i < appends; i++) {
      const serial = serials[(i * 7919) % serials.length] as string;
      const t0 = performance.now();
      await log.appendReading(serial, {
        run: `u-bench${((i * 7919) % serials.length).toString(36)}`,
        check: `stage${i % checks}.out.dc`,
        value: 1.05,
        unit: 'V',
        raw: '1.05',
        operator: 'bench',
        verdict: 'pass',
        planHash,
      });
      lat.push(performance.now() - t0);
    }
    const cpuUsed = process.cpuUsage(cpu0);
    const appendCpu = (cpuUsed.user + cpuUsed.system) / 1000 / appends;
    lat.sort((a, b) => a - b);

    // Opening the index as the bench screen does: a fresh store, snapshot plus the journal of those appends.
    const opens: number[] = [];
    const openCpus: number[] = [];
    for (let i = 0; i < 3; i++) {
      const o0 = performance.now();
      const c0 = process.cpuUsage();
      await (await openLog(dir)).readIndex();
      const c = process.cpuUsage(c0);
      opens.push(performance.now() - o0);
      openCpus.push((c.user + c.system) / 1000);
    }
    opens.sort((a, b) => a - b);
    openCpus.sort((a, b) => a - b);

    const h: number[] = [];
    for (let i = 0; i < 5; i++) h.push(await timeCommand(['history', serials[i % serials.length] as string, '--json', '--log', dir]));
    h.sort((a, b) => a - b);
    rows.push({
      boards: count,
      rebuild,
      open: quantile(opens, 0.5),
      openCpu: quantile(openCpus, 0.5),
      median: quantile(lat, 0.5),
      p99: quantile(lat, 0.99),
      appendCpu,
      floor: floorHere,
      history: quantile(h, 0.5),
      indexMb,
    });
  } finally {
    // PROBEBOOK_BENCH_KEEP=1 keeps the folders for a closer look.
    if (process.env.PROBEBOOK_BENCH_KEEP) process.stdout.write(`  kept ${dir}\n`);
    else rmSync(dir, { recursive: true, force: true });
  }
}

/** The contrast: one JSON file with every reading, read, extended and rewritten (fsynced) per append. */
function singleFileAppend(readings: number): number {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-bench-one-'));
  try {
    const path = join(dir, 'all.json');
    const one = {
      id: 'r-x',
      run: 'u-x',
      check: 'stage1.out.dc',
      value: 1.05,
      unit: 'V',
      raw: '1.05',
      at: '2026-03-02T08:00:00.000Z',
      operator: 'bench',
      verdict: 'pass',
      planHash,
    };
    writeFileSync(path, JSON.stringify({ readings: Array.from({ length: readings }, () => one) }));
    const lat: number[] = [];
    for (let i = 0; i < 20; i++) {
      const t0 = performance.now();
      const data = JSON.parse(readFileSync(path, 'utf8')) as { readings: unknown[] };
      data.readings.push(one);
      const fd = openSync(`${path}.tmp`, 'w');
      writeSync(fd, JSON.stringify(data));
      fsyncSync(fd);
      closeSync(fd);
      lat.push(performance.now() - t0);
    }
    return quantile(
      lat.sort((a, b) => a - b),
      0.5,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The floor under any durable append on this disk right now: replace a 20 kB file (write, fsync, rename, fsync folder). */
function rawReplace(): number {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-bench-raw-'));
  try {
    const body = 'x'.repeat(20_000);
    const lat: number[] = [];
    for (let i = 0; i < 50; i++) {
      const t0 = performance.now();
      const fd = openSync(join(dir, 'f.tmp'), 'w');
      writeSync(fd, body);
      fsyncSync(fd);
      closeSync(fd);
      renameSync(join(dir, 'f.tmp'), join(dir, 'f.json'));
      const d = openSync(dir, 'r');
      fsyncSync(d);
      closeSync(d);
      lat.push(performance.now() - t0);
    }
    return quantile(
      lat.sort((a, b) => a - b),
      0.5,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
const base = rows[0];
process.stdout.write(
  `\nboards   readings  append median (cpu)  p99       disk floor  median/floor  history --json  open index (cpu)     index rebuild  index.json\n`,
);
for (const r of rows) {
  process.stdout.write(
    `${String(r.boards).padStart(6)}  ${String(r.boards * perBoard).padStart(8)}  ${`${ms(r.median)} (${ms(r.appendCpu)})`.padStart(19)}  ${ms(r.p99).padStart(8)}  ${ms(r.floor).padStart(10)}  ${`×${(r.median / r.floor).toFixed(2)}`.padStart(12)}  ${ms(r.history).padStart(14)}  ${`${ms(r.open)} (${ms(r.openCpu)})`.padStart(19)}  ${ms(r.rebuild).padStart(13)}  ${`${r.indexMb.toFixed(1)} MB`.padStart(10)}\n`,
  );
}
const last = rows.at(-1);
if (base && last) {
  process.stdout.write(
    `per-reading cost from ${base.boards} to ${last.boards} boards: append cpu ×${(last.appendCpu / base.appendCpu).toFixed(2)}, append median ×${(last.median / base.median).toFixed(2)}\n`,
  );
  process.stdout.write(
    `goals at ${last.boards} boards: append median ${ms(last.median)} (goal < 5 ms), open index ${ms(last.open)} (goal < 200 ms); on a loaded machine compare the cpu figures and the ratio to the disk floor\n`,
  );
}
process.stdout.write('\none file with every reading, rewritten per append (the layout not taken):\n');
for (const n of [10_000, 100_000]) {
  const t = singleFileAppend(n);
  process.stdout.write(`  ${String(n).padStart(7)} readings: ${ms(t)} per append (×${(t / (base?.median ?? t)).toFixed(1)} the per-board append)\n`);
}
