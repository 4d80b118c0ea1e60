import type { BoardHead } from '../../log/types.js';
import { cell } from '../components/columns.js';
import { stateMark, stateWord } from '../theme.js';
import { formatWhen } from './board-order.js';

/** Columns between two cells: every cell is followed by this many spaces, so no two columns ever touch. */
export const columnGap = 1;

/** The widths of the boards table's columns at a terminal width (each without its gap). */
export interface BoardColumns {
  readonly serial: number;
  readonly plan: number;
  /** 0 when the last-run column does not fit. */
  readonly when: number;
  readonly state: number;
  readonly showCounts: boolean;
}

/** `2026-11-03 10:42`, the widest last-run text. */
const whenWidth = 16;
/** `▶ in progress`, the widest state text. */
const stateWidth = Math.max(
  ...Object.keys(stateWord).map((s) => [...`${stateMark[s as keyof typeof stateMark]} ${stateWord[s as keyof typeof stateWord]}`].length),
);
/** Runs, readings and rework, right-aligned, each with its gap before it. */
const countWidths = [5, 9, 7] as const;
const countsWidth = countWidths.reduce((sum, w) => sum + columnGap + w, 0);
/** The pointer and the space after it. */
const lead = 2;

/**
 * Which columns fit: serial, plan and state always; last run from 64 columns,
 * counts from 90. Serial and plan share what is left (a plan id longer than
 * its column is cut with `…`, never run into the next column).
 */
export function boardColumns(width: number): BoardColumns {
  const showWhen = width >= 64;
  const showCounts = width >= 90;
  const fixed = lead + (showWhen ? whenWidth + columnGap : 0) + stateWidth + (showCounts ? countsWidth : 0);
  // What serial and plan share, each with its gap.
  const free = Math.max(0, width - fixed - 2 * columnGap);
  const serial = Math.max(8, Math.min(24, Math.floor(free * 0.55)));
  const plan = Math.max(6, Math.min(24, free - serial));
  return { serial, plan, when: showWhen ? whenWidth : 0, state: stateWidth, showCounts };
}

/** The text of a row's cells, each padded or cut to its column and followed by its gap (the last without one). */
export function boardCells(b: BoardHead, col: BoardColumns): { readonly before: string; readonly state: string; readonly after: string } {
  const gap = ' '.repeat(columnGap);
  const before = cell(b.serial, col.serial) + gap + cell(b.plan ?? '—', col.plan) + gap + (col.when > 0 ? cell(formatWhen(b.lastRunAt), col.when) + gap : '');
  const state = cell(`${stateMark[b.state]} ${stateWord[b.state]}`, col.state);
  const after = col.showCounts ? countWidths.map((w, i) => gap + cell(String([b.runs, b.readings, b.rework][i]), w, 'right')).join('') : '';
  return { before, state, after };
}

/** The header line of the table, in the same columns. */
export function boardHeader(col: BoardColumns): string {
  const gap = ' '.repeat(columnGap);
  const counts = ['runs', 'readings', 'rework'];
  return (
    ' '.repeat(lead) +
    cell('serial', col.serial) +
    gap +
    cell('plan', col.plan) +
    gap +
    (col.when > 0 ? cell('last run', col.when) + gap : '') +
    cell('state', col.state) +
    (col.showCounts ? countWidths.map((w, i) => gap + cell(counts[i] ?? '', w, 'right')).join('') : '')
  );
}
