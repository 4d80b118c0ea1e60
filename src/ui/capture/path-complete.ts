import { readdirSync, statSync } from 'node:fs';
import { homedir } from 'node:os';
import { join, resolve } from 'node:path';

export interface Completion {
  /** The text after completion (unchanged when nothing fits). */
  readonly text: string;
  /** Names that fit when more than one does (directories end in `/`), at most `limit`. */
  readonly candidates: readonly string[];
  /** How many names fit in all. */
  readonly matches: number;
}

/** Expand a leading `~` and resolve against `cwd`. */
export function expandPath(text: string, cwd: string): string {
  const t = text.startsWith('~') ? join(homedir(), text.slice(1)) : text;
  return resolve(cwd, t);
}

/**
 * Complete a typed path from the file system, as a shell's Tab does: a single
 * match is completed (a folder gets its `/`), several are completed to their
 * common prefix and listed. Unreadable folders complete nothing.
 */
export function completePath(text: string, cwd: string, limit = 8): Completion {
  const slash = text.lastIndexOf('/');
  const dirPart = slash >= 0 ? text.slice(0, slash + 1) : '';
  const base = slash >= 0 ? text.slice(slash + 1) : text;
  const folder = dirPart === '' ? cwd : expandPath(dirPart, cwd);
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    return { text, candidates: [], matches: 0 };
  }
  // Hidden files only when asked for with a leading dot.
  const fits = names.filter((n) => n.startsWith(base) && (base.startsWith('.') || !n.startsWith('.'))).sort();
  const decorate = (n: string): string => (isDir(join(folder, n)) ? `${n}/` : n);
  if (fits.length === 0) return { text, candidates: [], matches: 0 };
  if (fits.length === 1) return { text: dirPart + decorate(fits[0] as string), candidates: [], matches: 1 };
  const common = commonPrefix(fits);
  return { text: dirPart + common, candidates: fits.slice(0, limit).map(decorate), matches: fits.length };
}

function isDir(path: string): boolean {
  try {
    return statSync(path).isDirectory();
  } catch {
    return false;
  }
}

function commonPrefix(names: readonly string[]): string {
  let prefix = names[0] ?? '';
  for (const n of names) while (!n.startsWith(prefix)) prefix = prefix.slice(0, -1);
  return prefix;
}
