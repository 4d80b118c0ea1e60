// `npm start`: open the bench screen on the demo plans with a writable copy of
// an invented demo log. The log lives in `.demo-log/` at the repository root
// (git-ignored, never committed) and is made again by `demo/make-demo-log.ts`
// whenever it is missing or its demo sources changed; delete the folder for a fresh one. PROBEBOOK_DEMO_LOG
// puts it elsewhere (the real-terminal test uses a temporary folder).
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const logDir = process.env.PROBEBOOK_DEMO_LOG ? resolve(process.env.PROBEBOOK_DEMO_LOG) : join(root, '.demo-log');
const bundle = join(root, 'dist', 'probebook.js');
const plans = ['demo/exciter.plan.json', 'demo/line-driver.plan.json', 'demo/calibrator.plan.json'];

/** The newest modification time of the files under `dir`, ms. */
function newest(dir) {
  let latest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    latest = Math.max(latest, entry.isDirectory() ? newest(path) : statSync(path).mtimeMs);
  }
  return latest;
}

function run(args, what) {
  const result = spawnSync(process.execPath, args, { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error(`probebook demo: ${what} failed (exit ${result.status ?? result.signal}).`);
    process.exit(1);
  }
}

// Build the bundle when it is missing or older than the sources.
if (!existsSync(bundle) || !existsSync(join(root, 'dist', 'targets-worker.js')) || statSync(bundle).mtimeMs < newest(join(root, 'src'))) {
  console.log('probebook demo: building dist/probebook.js …');
  run(['scripts/build.mjs'], 'the build');
}
// The demo sources the scratch log is made from: when they change (a pull brought new demo
// boards or plans), the scratch log is made again and the old one kept beside it.
const demoSources = ['demo/make-demo-log.ts', 'demo/make-captures.ts', ...plans];
const sourceHash = createHash('sha256');
for (const file of demoSources) if (existsSync(join(root, file))) sourceHash.update(file).update(readFileSync(join(root, file)));
const stamp = sourceHash.digest('hex');
const stampFile = join(logDir, '.demo-sources');
if (existsSync(join(logDir, 'boards'))) {
  const previous = existsSync(stampFile) ? readFileSync(stampFile, 'utf8').trim() : '';
  if (previous !== stamp) {
    const kept = `${logDir}.previous`;
    console.log(
      `probebook demo: the demo plans or boards changed since ${relative(process.cwd(), logDir) || logDir} was made; making it again (the old one is kept in ${relative(process.cwd(), kept) || kept}) …`,
    );
    rmSync(kept, { recursive: true, force: true });
    renameSync(logDir, kept);
  }
}
if (!existsSync(join(logDir, 'boards'))) {
  console.log(`probebook demo: writing the invented demo log to ${relative(process.cwd(), logDir) || logDir} …`);
  // Written beside it and renamed into place, so an interrupted run leaves no half log behind.
  const partial = `${logDir}.partial-${process.pid}`;
  rmSync(partial, { recursive: true, force: true });
  run(['--import', 'tsx', 'demo/make-demo-log.ts', partial], 'writing the demo log');
  writeFileSync(join(partial, '.demo-sources'), `${stamp}\n`);
  rmSync(logDir, { recursive: true, force: true });
  renameSync(partial, logDir);
}
const args = [bundle, '--log', logDir, ...plans.flatMap((p) => ['--plan', join(root, p)]), ...process.argv.slice(2)];
const result = spawnSync(process.execPath, args, { stdio: 'inherit' });
process.exitCode = result.status ?? 1;
