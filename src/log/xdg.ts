import { homedir } from 'node:os';
import { isAbsolute, join } from 'node:path';

/** The XDG base directories probebook uses, with their defaults under the home folder. */
const defaults = {
  XDG_DATA_HOME: ['.local', 'share'],
  XDG_CACHE_HOME: ['.cache'],
  XDG_CONFIG_HOME: ['.config'],
} as const;

/**
 * A base directory of the XDG Base Directory Specification: the variable when it
 * holds an absolute path, else the default under the home folder. "All paths set
 * in these environment variables must be absolute. If an implementation
 * encounters a relative path in any of these variables it should consider the
 * path invalid and ignore it." (the specification, version 0.8).
 */
export function xdgBase(env: NodeJS.ProcessEnv, name: keyof typeof defaults): string {
  const value = env[name];
  if (value !== undefined && value !== '' && isAbsolute(value)) return value;
  return join(homedir(), ...defaults[name]);
}
