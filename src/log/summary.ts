import type { BoardFile, BoardState, BoardSummary, CheckSummary, Run } from './types.js';

/**
 * Where a board stands, from its runs and rework notes:
 * - `in-progress`: its latest run has not ended, or was aborted (bring-up begun, not concluded);
 * - `untouched`: no readings yet (and no open run);
 * - `reworked`: a rework note dated after its latest run ended (the verdict of that
 *   run, pass or fail, no longer describes the board: measure it again);
 * - `passed` / `failed`: the outcome of the latest run (`power-off` counts as failed).
 */
export function boardState(board: Pick<BoardFile, 'runs' | 'readings' | 'rework'>): BoardState {
  const last: Run | undefined = board.runs[board.runs.length - 1];
  if (last && (last.ended === null || last.outcome === 'in-progress')) return 'in-progress';
  if (board.readings.length === 0) return 'untouched';
  if (!last) return 'in-progress';
  const ended = last.ended ?? last.started;
  if (board.rework.some((note) => note.at > ended)) return 'reworked';
  if (last.outcome === 'passed') return 'passed';
  if (last.outcome === 'aborted') return 'in-progress';
  return 'failed';
}

/** A board's line in the index: counts, state and the first and latest reading of each check. */
export function summarizeBoard(board: BoardFile): BoardSummary {
  const checks: Record<string, CheckSummary> = {};
  for (const r of board.readings) {
    const point = { value: r.value, verdict: r.verdict, at: r.at };
    const seen = checks[r.check];
    checks[r.check] = seen ? { first: seen.first, latest: point, count: seen.count + 1 } : { first: point, latest: point, count: 1 };
  }
  const last = board.runs[board.runs.length - 1];
  return {
    serial: board.serial,
    plan: board.plan,
    planHash: last?.planHash ?? null,
    state: boardState(board),
    lastRunAt: last?.started ?? null,
    runs: board.runs.length,
    readings: board.readings.length,
    rework: board.rework.length,
    checks,
  };
}
