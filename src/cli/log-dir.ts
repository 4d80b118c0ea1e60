import { join, resolve } from 'node:path';
import { xdgBase } from '../log/xdg.js';
import { UsageError } from './errors.js';

/**
 * The log (DESIGN §6): `--log DIR|URL`, else `PROBEBOOK_LOG`, else the user's
 * data folder per the XDG Base Directory Specification (`$XDG_DATA_HOME/probebook`,
 * default `~/.local/share/probebook`; a relative `XDG_DATA_HOME` is ignored, as
 * the specification says). An empty `--log` is refused: it would quietly fall
 * back to the home log.
 */
export function resolveLogDir(flag: string | boolean | undefined, env: NodeJS.ProcessEnv = process.env): string {
  // A URL (postgres://…) is a location, not a path: it stays as written (src/log/location.ts checks it).
  const place = (text: string) => (/^[a-z][a-z0-9+.-]*:\/\//i.test(text) ? text : resolve(text));
  if (typeof flag === 'string') {
    if (flag.trim() === '') throw new UsageError('--log needs a folder (or a PostgreSQL URL); leave it out to use $PROBEBOOK_LOG or the data folder');
    return place(flag);
  }
  if (env.PROBEBOOK_LOG) return place(env.PROBEBOOK_LOG);
  return join(xdgBase(env, 'XDG_DATA_HOME'), 'probebook');
}
