import { readdirSync, readFileSync, statSync, unlinkSync } from 'node:fs';
import { uptime } from 'node:os';
import { join } from 'node:path';
import { errorCode } from './errors.js';
import { validateSerial } from './serial.js';

/** Temporary files of the durable writes (`<file>.<pid>-<hex>.tmp`); removed once an hour old. */
const leftoverPattern = /\.\d+-[0-9a-f]{8}\.(tmp|baktmp)$/;
const leftoverAgeMs = 60 * 60 * 1000;

/** The identity of a board file's current version; a rename of a new version changes it. */
export function fileStamp(path: string): string | null {
  try {
    // Plain (not bigint) stat is twice as fast over thousands of boards; mtimeMs keeps microseconds.
    const s = statSync(path);
    return `${s.ino}-${s.size}-${s.mtimeMs}`;
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}

/** A folder's modification time (it moves whenever an entry is added, renamed or removed), or null. */
export function folderTime(path: string): number | null {
  try {
    return statSync(path).mtimeMs;
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}

let boot: string | undefined;

/**
 * This boot of the machine: after a power loss, lines of the index journal that
 * were not yet on disk may be gone, so a new boot means "check every board".
 */
export function bootId(): string {
  if (boot === undefined) {
    try {
      boot = readFileSync('/proc/sys/kernel/random/boot_id', 'utf8').trim();
    } catch {
      // No boot id here: the boot time to the minute (a false change only costs a full check).
      boot = `up-${Math.round((Date.now() / 1000 - uptime()) / 60)}`;
    }
  }
  return boot;
}

/** Board serials in the boards folder (sweeping hour-old temporary files of killed writers). */
export function boardSerials(boardsDir: string): string[] {
  let names: string[];
  try {
    names = readdirSync(boardsDir);
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return [];
    throw error;
  }
  const serials: string[] = [];
  for (const name of names) {
    if (leftoverPattern.test(name)) removeIfOld(join(boardsDir, name));
    else if (name.endsWith('.json') && validateSerial(name.slice(0, -5)) === null) serials.push(name.slice(0, -5));
  }
  return serials;
}

function removeIfOld(path: string): void {
  try {
    if (Date.now() - statSync(path).mtimeMs > leftoverAgeMs) unlinkSync(path);
  } catch (error) {
    if (errorCode(error) !== 'ENOENT') throw error;
  }
}

/** Stamps of the given boards' files (boards whose file vanished are left out). */
export function stampsOf(boardsDir: string, serials: Iterable<string>): Map<string, string> {
  const stamps = new Map<string, string>();
  for (const serial of serials) {
    const stamp = fileStamp(join(boardsDir, `${serial}.json`));
    if (stamp !== null) stamps.set(serial, stamp);
  }
  return stamps;
}
