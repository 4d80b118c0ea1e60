// Types of scripts/bench-goals.mjs (plain JavaScript: scripts run without a build step).
export interface GoalRow {
  readonly id: string;
  /** The bench that measures it (`npm run bench <bench>`). */
  readonly bench: string;
  readonly work: string;
  /** The figure before the work. */
  readonly today: string;
  readonly goal: string;
  /** Met when the figure is at most this, in `unit`. */
  readonly limit: number;
  readonly unit: string;
}
export interface GoalFigure {
  readonly id: string;
  readonly figure: number | null;
  readonly note?: string;
}
export function readGoalRows(file: string): GoalRow[];
export function parseFigures(text: string): Map<string, GoalFigure>;
export function formatFigure(v: number, unit: string): string;
export function goalTable(rows: readonly GoalRow[], figures: Map<string, GoalFigure>, ran: Map<string, number | null>): string[];
