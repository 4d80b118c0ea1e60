/**
 * Reference designators by part (`osc.Ct` → `C7`, `osc.clamp` → `D3/D4`) from
 * a plan's text: each stage's optional `refs` (role → designator). Read from
 * the text so that review screens can name parts of any plan revision they
 * hold a snapshot of; empty when the text has none or does not parse.
 */
export function refsOfPlanText(text: string | null | undefined): Map<string, string> {
  const out = new Map<string, string>();
  if (!text) return out;
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return out;
  }
  const stages = (json as { stages?: unknown }).stages;
  if (!Array.isArray(stages)) return out;
  for (const s of stages as { id?: unknown; refs?: unknown }[]) {
    if (typeof s?.id !== 'string' || typeof s.refs !== 'object' || s.refs === null) continue;
    for (const [role, ref] of Object.entries(s.refs as Record<string, unknown>))
      if (typeof ref === 'string' && ref.trim() !== '') out.set(`${s.id}.${role}`, ref.trim());
  }
  return out;
}

/** `osc.Ct (C7)`: the part with its designator when the plan names one (a group's for a part inside it: `osc.clamp.vz` → `osc.clamp`'s). */
export function partWithRef(part: string, refs: ReadonlyMap<string, string>): string {
  let key = part;
  for (;;) {
    const ref = refs.get(key);
    if (ref) return `${part} (${ref})`;
    const cut = Math.max(key.lastIndexOf('.'), key.lastIndexOf('['));
    if (cut <= key.indexOf('.')) return part;
    key = key.slice(0, cut);
  }
}
