import { homedir } from 'node:os';
import { join, resolve } from 'node:path';

/**
 * The log (DESIGN §6): `--log DIR|URL`, else `PROBEBOOK_LOG`, else the user's
 * data folder per the XDG Base Directory Specification (`$XDG_DATA_HOME/probebook`,
 * default `~/.local/share/probebook`).
 */
export function resolveLogDir(flag: string | boolean | undefined, env: NodeJS.ProcessEnv = process.env): string {
  // A URL (postgres://…) is a location, not a path: it stays as written (src/log/location.ts checks it).
  const place = (text: string) => (/^[a-z][a-z0-9+.-]*:\/\//i.test(text) ? text : resolve(text));
  if (typeof flag === 'string' && flag !== '') return place(flag);
  if (env.PROBEBOOK_LOG) return place(env.PROBEBOOK_LOG);
  const data = env.XDG_DATA_HOME && env.XDG_DATA_HOME !== '' ? env.XDG_DATA_HOME : join(homedir(), '.local', 'share');
  return join(data, 'probebook');
}
