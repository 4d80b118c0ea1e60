// `npm run bench`: run every bench/*.ts in turn (through tsx), each printing its
// own figures and ratios. Benchmarks are not tests: nothing here fails the build.
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';

const only = process.argv.slice(2);
const files = readdirSync('bench')
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();
for (const file of files) {
  console.log(`\n== ${file} ==`);
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--expose-gc', `bench/${file}`], { stdio: 'inherit' });
  if (r.status !== 0) console.log(`(${file} exited ${r.status})`);
}
