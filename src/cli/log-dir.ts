import { join, resolve } from 'node:path';
import { xdgBase } from '../log/xdg.js';
import { UsageError } from './errors.js';

/**
 * The log folder (DESIGN §6): `--log DIR`, else `PROBEBOOK_LOG`, else the user's
 * data folder per the XDG Base Directory Specification (`$XDG_DATA_HOME/probebook`,
 * default `~/.local/share/probebook`; a relative `XDG_DATA_HOME` is ignored, as
 * the specification says). An empty `--log` is refused: it would quietly fall
 * back to the home log.
 */
export function resolveLogDir(flag: string | boolean | undefined, env: NodeJS.ProcessEnv = process.env): string {
  if (typeof flag === 'string') {
    if (flag.trim() === '') throw new UsageError('--log needs a folder (or a PostgreSQL URL); leave it out to use $PROBEBOOK_LOG or the data folder');
    return resolve(flag);
  }
  if (env.PROBEBOOK_LOG) return resolve(env.PROBEBOOK_LOG);
  return join(xdgBase(env, 'XDG_DATA_HOME'), 'probebook');
}
