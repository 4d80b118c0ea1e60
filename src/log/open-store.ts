import { parseLogLocation } from './location.js';
import { openLog, type LogStore } from './store.js';

export interface OpenOptions {
  /**
   * A command that only reads (history, report, batch) never creates a log:
   * a folder that does not exist is an error. A database is created only by
   * the schema's first use, which any command may make.
   */
  readonly mustExist?: boolean;
  /** Told at once when a board's lock (in a folder log) holds a write up (see `LogOptions`). */
  readonly onLockWait?: (message: string) => void;
}

/** Open the log a location names (a folder or a PostgreSQL URL, DESIGN §6), chosen once here. */
export async function openStore(location: string, options: OpenOptions = {}): Promise<LogStore> {
  const where = parseLogLocation(location);
  if (where.kind === 'postgres') {
    const { openPgLog } = await import('./pg-store.js');
    return openPgLog(where.url, where.shown);
  }
  // Read-only: the folder must already be a log, and opening it creates nothing (a mistyped --log leaves no trace).
  return openLog(where.path, { ...(options.mustExist ? { isReadOnly: true } : {}), ...(options.onLockWait ? { onLockWait: options.onLockWait } : {}) });
}
