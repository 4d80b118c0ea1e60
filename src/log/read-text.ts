import { readFileSync } from 'node:fs';
import { errorCode } from './errors.js';

/** A file's text, or null when it does not exist; any other I/O error is thrown (a missing file means "empty"). */
export function readTextIfAny(path: string): string | null {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}
