// Issue 15's goal rows, reported by the benchmark that measures each one.
// `npm run bench` (scripts/bench.mjs) names a file in PROBEBOOK_BENCH_GOALS; each
// figure is appended to it as one JSON line, and the script prints one table of
// every goal at the end of the run (bench/goals.json lists them: today's figure,
// the goal, its limit and unit). Run on its own, a bench writes nothing here.
import { appendFileSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

interface GoalDefinition {
  readonly id: string;
  readonly bench: string;
  readonly unit: string;
}

const known: readonly GoalDefinition[] = (JSON.parse(readFileSync(join(import.meta.dirname, 'goals.json'), 'utf8')) as { rows: GoalDefinition[] }).rows;

/**
 * One measured figure of a goal row, in the row's unit (`ms`, or a ratio). A
 * figure that could not be measured (a missing reference, another board count)
 * is NaN with a note saying why.
 */
export function reportGoal(id: string, figure: number, note?: string): void {
  if (!known.some((g) => g.id === id)) throw new Error(`bench/goals.json has no goal ${JSON.stringify(id)}`);
  const file = process.env['PROBEBOOK_BENCH_GOALS'];
  if (!file) return;
  appendFileSync(file, `${JSON.stringify({ id, figure: Number.isFinite(figure) ? figure : null, ...(note ? { note } : {}) })}\n`);
}
