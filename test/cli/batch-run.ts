import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main.js';

/** A targets cache of this test process's own, so no test writes into the user's cache folder. */
export const cacheDir = mkdtempSync(join(tmpdir(), 'probebook-cache-'));

/** Run probebook as the shell would (through `main`), capturing its output. */
export async function run(argv: string[], env: NodeJS.ProcessEnv = {}) {
  let stdout = '';
  let stderr = '';
  const status = await main(argv, {
    stdout: (t) => (stdout += t),
    stderr: (t) => (stderr += t),
    env: { PROBEBOOK_CACHE: cacheDir, ...env },
    cwd: process.cwd(),
  });
  return { status, stdout, stderr };
}
