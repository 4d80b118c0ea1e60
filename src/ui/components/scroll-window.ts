/**
 * The rows of a list to show: a window of `size` rows that keeps `selected`
 * in view, scrolling only when the selection would leave it.
 */
export function scrollWindow(count: number, selected: number, size: number, previousStart = 0): { start: number; end: number } {
  const rows = Math.max(1, size);
  if (count <= rows) return { start: 0, end: count };
  let start = Math.min(Math.max(0, previousStart), count - rows);
  if (selected < start) start = selected;
  if (selected >= start + rows) start = selected - rows + 1;
  start = Math.max(0, Math.min(start, count - rows));
  return { start, end: start + rows };
}

/** Move a selection by `delta` within `[0, count)`, clamped. */
export function moveSelection(selected: number, delta: number, count: number): number {
  if (count <= 0) return 0;
  return Math.max(0, Math.min(count - 1, selected + delta));
}
