import type { BoardHead } from './index-journal.js';

/**
 * Boards by latest activity: the latest run first (the board on the bench now
 * is at the top), boards without a run last, then by serial. The bench screen
 * lists boards in this order, and the index keeps its first rows apart in this
 * order so that screen can draw them before it reads the whole index.
 */
export function byActivity(a: Pick<BoardHead, 'serial' | 'lastRunAt'>, b: Pick<BoardHead, 'serial' | 'lastRunAt'>): number {
  if (a.lastRunAt !== b.lastRunAt) {
    if (a.lastRunAt === null) return 1;
    if (b.lastRunAt === null) return -1;
    return a.lastRunAt < b.lastRunAt ? 1 : -1;
  }
  return a.serial < b.serial ? -1 : a.serial > b.serial ? 1 : 0;
}
