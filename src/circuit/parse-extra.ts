import { StageParseError } from './errors.js';
import type { StageReader } from './stage-parse.js';

/** A yes/no setting (`"periodic": false`); absent gives the fallback. */
export function booleanAt(r: StageReader, key: string, fallback: boolean): boolean {
  const raw = r.json[key];
  if (raw === undefined) return fallback;
  if (typeof raw !== 'boolean') throw new StageParseError(r.file, `${r.path}.${key}`, `${JSON.stringify(raw)} must be true or false, e.g. ${String(fallback)}`);
  return raw;
}
