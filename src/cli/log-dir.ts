import { homedir } from 'node:os';
import { join, resolve } from 'node:path';

/**
 * The log folder (DESIGN §6): `--log DIR`, else `PROBEBOOK_LOG`, else the user's
 * data folder per the XDG Base Directory Specification (`$XDG_DATA_HOME/probebook`,
 * default `~/.local/share/probebook`).
 */
export function resolveLogDir(flag: string | boolean | undefined, env: NodeJS.ProcessEnv = process.env): string {
  if (typeof flag === 'string' && flag !== '') return resolve(flag);
  if (env.PROBEBOOK_LOG) return resolve(env.PROBEBOOK_LOG);
  const data = env.XDG_DATA_HOME && env.XDG_DATA_HOME !== '' ? env.XDG_DATA_HOME : join(homedir(), '.local', 'share');
  return join(data, 'probebook');
}
