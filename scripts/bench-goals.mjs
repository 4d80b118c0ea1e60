// The summary table `npm run bench` ends with: every goal row of issue 15
// (bench/goals.json), the figure this run measured (each goal bench appends
// JSON lines through bench/goals.ts to the file scripts/bench.mjs names in
// PROBEBOOK_BENCH_GOALS), the "today" figure, the goal, and whether
// this run met it.
import { readFileSync } from 'node:fs';

/**
 * @typedef {{ id: string, bench: string, work: string, today: string, goal: string, limit: number, unit: string }} GoalRow
 * @typedef {{ id: string, figure: number | null, note?: string }} GoalFigure
 */

/** @param {string} file @returns {GoalRow[]} */
export function readGoalRows(file) {
  return JSON.parse(readFileSync(file, 'utf8')).rows;
}

/**
 * The figures in a goals file, the last one of each id winning; a line that is
 * not a figure (a bench killed mid-write) is passed over.
 * @param {string} text @returns {Map<string, GoalFigure>}
 */
export function parseFigures(text) {
  const figures = new Map();
  for (const line of text.split('\n')) {
    if (line.trim() === '') continue;
    try {
      const f = JSON.parse(line);
      if (typeof f?.id === 'string' && (f.figure === null || typeof f.figure === 'number')) figures.set(f.id, f);
    } catch {
      // a torn line: its bench said nothing usable
    }
  }
  return figures;
}

/** @param {number} v @param {string} unit */
export function formatFigure(v, unit) {
  if (unit === 'ms') return `${v < 10 ? v.toFixed(1) : v.toFixed(0)} ms`;
  return `${v.toFixed(2)}×`;
}

/**
 * The table as lines of text.
 * @param {readonly GoalRow[]} rows
 * @param {Map<string, GoalFigure>} figures
 * @param {Map<string, number | null>} ran exit status of each bench that ran, by name (`tolerance`)
 */
export function goalTable(rows, figures, ran) {
  const cells = rows.map((row) => {
    const f = figures.get(row.id);
    let now = '—';
    let verdict;
    if (f && f.figure !== null) {
      now = formatFigure(f.figure, row.unit);
      verdict = f.figure <= row.limit ? 'met' : 'not met';
    } else if (f) verdict = 'not measured';
    else if (!ran.has(row.bench)) verdict = 'not run';
    else verdict = ran.get(row.bench) === 0 ? 'no figure' : `no figure (bench exited ${ran.get(row.bench)})`;
    const note = f?.note ? `  ${f.note}` : '';
    return [row.work, row.today, now, row.goal, row.bench, `${verdict}${note}`];
  });
  const head = ['work', 'today', 'this run', 'goal', 'bench', 'verdict'];
  const all = [head, ...cells];
  const widths = head.map((_, c) => Math.max(...all.map((r) => (r[c] ?? '').length)));
  const line = (/** @type {string[]} */ r) =>
    r
      .map((cell, c) => (c === 0 || c === 4 ? cell.padEnd(widths[c] ?? 0) : c === 5 ? cell : cell.padStart(widths[c] ?? 0)))
      .join('  ')
      .trimEnd();
  const met = cells.filter((r) => r[5]?.startsWith('met')).length;
  const measured = cells.filter((r) => r[5]?.startsWith('met') || r[5]?.startsWith('not met')).length;
  return [
    `Issue 15's goals, this run: ${met} of ${rows.length} met (${measured} measured). "today" is the issue's figure before the work; × is a ratio; npm run bench BENCH measures a row.`,
    line(head),
    ...cells.map(line),
  ];
}
