// `npm run bench [name…]`: run every bench/*.bench.ts (or those whose name holds
// one of the words) in turn, through tsx, each printing its own figures and
// ratios; then one table of issue 15's goals with this run's figures (the goal
// benches report them through bench/goals.ts into the file named by
// PROBEBOOK_BENCH_GOALS). Benchmarks are not tests: nothing here fails the build.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { goalTable, parseFigures, readGoalRows } from './bench-goals.mjs';

const only = process.argv.slice(2);
const all = readdirSync('bench')
  .filter((f) => f.endsWith('.bench.ts'))
  .sort();
const files = all.filter((f) => only.length === 0 || only.some((o) => f.includes(o)));
if (files.length === 0) {
  console.error(`probebook bench: no bench matches ${only.join(', ')}; the benches are ${all.map((f) => f.replace(/\.bench\.ts$/, '')).join(', ')}`);
  process.exit(2);
}
const work = mkdtempSync(join(tmpdir(), 'probebook-bench-goals-'));
const goalsFile = join(work, 'goals.jsonl');
/** Exit status of each bench that ran, by name. */
const ran = new Map();
try {
  for (const file of files) {
    console.log(`\n== ${file} ==`);
    const r = spawnSync(process.execPath, ['--import', 'tsx', '--expose-gc', `bench/${file}`], {
      stdio: 'inherit',
      env: { ...process.env, PROBEBOOK_BENCH_GOALS: goalsFile },
    });
    ran.set(file.replace(/\.bench\.ts$/, ''), r.status);
    if (r.status !== 0) console.log(`(${file} exited ${r.status ?? r.signal})`);
  }
  const figures = parseFigures(existsSync(goalsFile) ? readFileSync(goalsFile, 'utf8') : '');
  console.log(`\n== summary ==\n${goalTable(readGoalRows(join('bench', 'goals.json')), figures, ran).join('\n')}`);
} finally {
  rmSync(work, { recursive: true, force: true });
}
