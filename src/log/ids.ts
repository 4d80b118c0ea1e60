import { randomBytes } from 'node:crypto';

/** What an id names. */
export type IdKind = 'reading' | 'run' | 'rework';

/** The letter an id starts with, by what it names (fixed: ids already in logs carry them). */
const idPrefix: Readonly<Record<IdKind, string>> = { reading: 'r', run: 'u', rework: 'w' };

let lastTime = 0;

/**
 * A short unique id, sortable by creation time: `<kind>-<ms since 1970 in
 * base 36, 9 digits>-<8 random base-36 digits>`, e.g. `r-0mhx2k3a1-4f9q0z1k`.
 * Within one process ids never go backwards even if the clock does.
 */
export function newId(kind: IdKind, now: number = Date.now()): string {
  lastTime = Math.max(lastTime, now);
  const time = lastTime.toString(36).padStart(9, '0');
  const bytes = randomBytes(6);
  const random = (bytes.readUIntBE(0, 6) % 36 ** 8).toString(36).padStart(8, '0');
  return `${idPrefix[kind]}-${time}-${random}`;
}
