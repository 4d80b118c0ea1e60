import { byActivity } from '../../log/board-order.js';
import type { BoardHead } from '../../log/types.js';

/**
 * Boards as the bench screen lists them: the latest activity first (the board
 * on the bench now is at the top), boards without a run last, then by serial.
 */
export function orderBoards<B extends BoardHead>(boards: Iterable<B>): B[] {
  return [...boards].sort(byActivity);
}

/** Boards whose serial or plan contains `filter` (case-insensitive); all when it is empty. */
export function filterBoards<B extends BoardHead>(boards: readonly B[], filter: string): readonly B[] {
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
