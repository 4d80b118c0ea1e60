import { main } from '../../src/cli/main.js';

/** Run probebook as the shell would (through `main`), capturing its output. */
export async function run(argv: string[], env: NodeJS.ProcessEnv = {}) {
  let stdout = '';
  let stderr = '';
  const status = await main(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), env, cwd: process.cwd() });
  return { status, stdout, stderr };
}
