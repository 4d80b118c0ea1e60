/**
 * A mistake in a stage's own plan entry, found by the kind's `parse`: the JSON
 * path and the remedy. The plan loader wraps it in its `PlanError` with the
 * file, so a stage kind never imports from `src/plan` (DESIGN §2).
 */
export class StageParseError extends Error {
  override readonly name = 'StageParseError';
  constructor(
    readonly file: string,
    readonly path: string,
    readonly detail: string,
  ) {
    super(`plan ${file}${path ? `, ${path}` : ''}: ${detail}`);
  }
}
