import { resolve, join } from 'node:path';
import { xdgBase } from './xdg.js';

/**
 * Where computed targets are cached between runs: `--cache DIR`, else
 * `$PROBEBOOK_CACHE`, else the XDG Base Directory cache folder
 * (`$XDG_CACHE_HOME/probebook`, default `~/.cache/probebook`). The same folder
 * serves every log: `--log` does not move it. Everything there may be deleted.
 */
export function resolveCacheDir(flag: string | undefined, env: NodeJS.ProcessEnv): string {
  if (flag !== undefined && flag !== '') return resolve(flag);
  if (env.PROBEBOOK_CACHE) return resolve(env.PROBEBOOK_CACHE);
  return join(xdgBase(env, 'XDG_CACHE_HOME'), 'probebook');
}
