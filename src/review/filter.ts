import type { BoardSummary, CheckSummary } from '../analysis/records.js';

/** Which boards and readings a batch review covers. */
export interface BatchFilter {
  /** Plan id. */
  readonly plan?: string;
  /** Plan revision: a plan hash or a prefix of one (at least 4 hex digits). */
  readonly revision?: string;
  /** One check id. */
  readonly check?: string;
  /** Inclusive lower bound on the latest reading's time, ms since epoch. */
  readonly from?: number;
  /** Inclusive upper bound on the latest reading's time, ms since epoch. */
  readonly to?: number;
}

/** Whether a board belongs to the filtered batch (plan and revision only). */
export function boardMatches(board: BoardSummary, filter: BatchFilter): boolean {
  if (filter.plan !== undefined && board.plan !== filter.plan) return false;
  if (filter.revision !== undefined && !(board.planHash ?? '').startsWith(filter.revision.toLowerCase())) return false;
  return true;
}

/** Whether one check's summary on a board falls in the filter (check id and date range of its latest reading). */
export function checkMatches(check: string, summary: CheckSummary, filter: BatchFilter): boolean {
  if (filter.check !== undefined && check !== filter.check) return false;
  if (filter.from === undefined && filter.to === undefined) return true;
  const at = Date.parse(summary.latest.at);
  if (Number.isNaN(at)) return false;
  if (filter.from !== undefined && at < filter.from) return false;
  if (filter.to !== undefined && at > filter.to) return false;
  return true;
}

/**
 * A date as typed on the bench: `2026-11-30` (a whole UTC day: the start of it
 * for `from`, the end of it for `to`) or a full ISO 8601 time. Null when the
 * text is not a date, so the caller can say what to type.
 */
export function parseDateBound(text: string, edge: 'from' | 'to'): number | null {
  const t = text.trim();
  const day = /^(\d{4})-(\d{2})-(\d{2})$/.exec(t);
  if (day) {
    const start = Date.UTC(Number(day[1]), Number(day[2]) - 1, Number(day[3]));
    const check = new Date(start);
    if (check.getUTCDate() !== Number(day[3]) || check.getUTCMonth() !== Number(day[2]) - 1) return null;
    return edge === 'from' ? start : start + 86_400_000 - 1;
  }
  if (!/^\d{4}-\d{2}-\d{2}T/.test(t)) return null;
  const ms = Date.parse(t);
  return Number.isNaN(ms) ? null : ms;
}

/** A one-line description of a filter for screen titles and reports. */
export function describeFilter(filter: BatchFilter): string {
  const parts: string[] = [];
  if (filter.plan !== undefined) parts.push(`plan ${filter.plan}`);
  if (filter.revision !== undefined) parts.push(`revision ${filter.revision.slice(0, 12)}`);
  if (filter.check !== undefined) parts.push(`check ${filter.check}`);
  if (filter.from !== undefined) parts.push(`from ${new Date(filter.from).toISOString()}`);
  if (filter.to !== undefined) parts.push(`to ${new Date(filter.to).toISOString()}`);
  return parts.length === 0 ? 'all boards' : parts.join(', ');
}
