import type { BoardSummary } from '../../log/types.js';

/**
 * Boards as the bench screen lists them: the latest activity first (the board
 * on the bench now is at the top), boards without a run last, then by serial.
 */
export function orderBoards(boards: Iterable<BoardSummary>): BoardSummary[] {
  return [...boards].sort((a, b) => {
    if (a.lastRunAt !== b.lastRunAt) {
      if (a.lastRunAt === null) return 1;
      if (b.lastRunAt === null) return -1;
      return a.lastRunAt < b.lastRunAt ? 1 : -1;
    }
    return a.serial < b.serial ? -1 : a.serial > b.serial ? 1 : 0;
  });
}

/** Boards whose serial or plan contains `filter` (case-insensitive); all when it is empty. */
export function filterBoards(boards: readonly BoardSummary[], filter: string): readonly BoardSummary[] {
  const needle = filter.trim().toLowerCase();
  if (needle === '') return boards;
  return boards.filter((b) => b.serial.toLowerCase().includes(needle) || (b.plan ?? '').toLowerCase().includes(needle));
}

/** `2026-11-03 10:42` in the bench's local time, or `—`. */
export function formatWhen(iso: string | null): string {
  if (iso === null) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return '—';
  const two = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())} ${two(d.getHours())}:${two(d.getMinutes())}`;
}
