import type { RunPlanShape } from './types.js';

/** Stage id → every stage downstream of it, following `input` references. */
export function downstreamMap(plan: RunPlanShape): ReadonlyMap<string, readonly string[]> {
  const children = new Map<string, string[]>();
  for (const s of plan.stages) {
    if (!s.input) continue;
    const list = children.get(s.input.stage) ?? [];
    list.push(s.id);
    children.set(s.input.stage, list);
  }
  const result = new Map<string, readonly string[]>();
  for (const s of plan.stages) {
    const seen = new Set<string>();
    const queue = [...(children.get(s.id) ?? [])];
    while (queue.length > 0) {
      const next = queue.shift() as string;
      if (seen.has(next)) continue;
      seen.add(next);
      queue.push(...(children.get(next) ?? []));
    }
    result.set(s.id, [...seen]);
  }
  return result;
}

/**
 * The stages a rework of `part` can change: its own stage and everything
 * downstream. A rail part (`rails.+12V`) or a part naming no known stage
 * touches every stage, since the run cannot tell what it feeds.
 */
export function stagesAffectedBy(part: string, downstream: ReadonlyMap<string, readonly string[]>): ReadonlySet<string> | 'all' {
  const stage = part.split('.')[0] ?? '';
  const below = downstream.get(stage);
  if (stage === 'rails' || below === undefined) return 'all';
  return new Set([stage, ...below]);
}
