/** How the bring-up screen shares its rows and columns. */
export interface BringUpLayout {
  /** Stage list width; 0 hides it (very narrow terminals). */
  readonly listWidth: number;
  readonly panelWidth: number;
  /** Rows between the header and the key bar. */
  readonly bodyRows: number;
  /** Rows for the verdict panel. */
  readonly verdictRows: number;
  /** Rows for the expected trace; 0 drops it. */
  readonly traceRows: number;
}

/** Fewer rows than this and the trace says nothing: it is dropped rather than squashed. */
export const minTraceRows = 5;

/**
 * Share the terminal: header and key bar one row each; the check panel, the
 * next-check line and the input (two rows) always; the verdict panel when there
 * is a reading (up to `verdictWanted` rows); the trace gets what is left.
 */
export function bringUpLayout(width: number, height: number, checkRows: number, verdictWanted: number, labelWidth = 24): BringUpLayout {
  // Mark, pointer and a space before each label; never more than a third of the width.
  const listWidth = width >= 64 ? Math.min(labelWidth + 4, Math.floor(width / 3)) : 0;
  const panelWidth = Math.max(20, width - listWidth - (listWidth > 0 ? 1 : 0));
  const bodyRows = Math.max(4, height - 2);
  const fixed = checkRows + 1 + 2;
  const verdictRows = Math.max(0, Math.min(verdictWanted, bodyRows - fixed));
  const left = bodyRows - fixed - verdictRows;
  const traceRows = left >= minTraceRows ? Math.min(left, 14) : 0;
  return { listWidth, panelWidth, bodyRows, verdictRows, traceRows };
}
