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
    // A detail may quote a whole bad value (130 k spaces): keep the line readable.
    super(`plan ${file}${path ? `, ${path}` : ''}: ${detail.length > 500 ? `${detail.slice(0, 500)}…` : detail}`);
  }
}
