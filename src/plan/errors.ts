/**
 * A mistake in a plan: names the file, the JSON path and the remedy, e.g.
 * `plan exciter.plan.json, stages[1].parts.Rt: "3k3 x" is not a resistance; write e.g. "3k3 1%"`.
 */
export class PlanError extends Error {
  override readonly name = 'PlanError';
  constructor(
    readonly file: string,
    readonly path: string,
    readonly detail: string,
  ) {
    super(`plan ${file}${path ? `, ${path}` : ''}: ${detail}`);
  }
}
