import { formatValue } from '../units/format.js';
import { parseValue } from '../units/parse.js';
import type { Unit } from '../units/unit.js';
import type { Bom, BomEntry } from './bom.js';
import type { Plan } from './types.js';

/** A part of the plan known by a reference designator (`refs` of its stage). */
export interface PlanRef {
  readonly ref: string;
  readonly stage: string;
  readonly stageIndex: number;
  readonly role: string;
  /** The part's value as the plan writes it, or null for a ref on a part group with no single value. */
  readonly text: string | null;
  readonly nominal: number | null;
  readonly tol: number | null;
  readonly unit: Unit | null;
}

export interface BomDifference {
  readonly ref: string;
  readonly part: string;
  readonly plan: string;
  readonly bom: string;
  /** The value to write (`--write`): the BOM's value with the BOM's tolerance, else the plan's. */
  readonly write: string;
  /** JSON path of the part's value in the plan, for the update. */
  readonly path: readonly (string | number)[];
}

export interface BomReport {
  readonly differences: readonly BomDifference[];
  readonly same: number;
  readonly onlyInPlan: readonly PlanRef[];
  readonly onlyInBom: readonly BomEntry[];
  readonly unreadable: readonly { readonly ref: string; readonly line: number; readonly message: string }[];
}

/** Where a role's value sits inside its stage's JSON: `Ct` → parts.Ct, `branches[1].R` → branches.1.R, `clamp.vz` → clamp.vz. */
export function rolePath(role: string): (string | number)[] {
  if (!/[.[]/.test(role)) return ['parts', role];
  const out: (string | number)[] = [];
  for (const piece of role.split('.')) {
    const m = /^([^[\]]+)((?:\[\d+\])*)$/.exec(piece);
    if (!m) return ['parts', role];
    out.push(m[1] ?? piece);
    for (const idx of (m[2] ?? '').matchAll(/\[(\d+)\]/g)) out.push(Number(idx[1]));
  }
  return out;
}

/** Every designator the plan names, with its part (a `"D3/D4"` ref names two designators of one part). */
export function planRefs(plan: Plan): PlanRef[] {
  const raw = JSON.parse(plan.text) as { stages?: { id?: string; refs?: Record<string, string> }[] };
  const out: PlanRef[] = [];
  (raw.stages ?? []).forEach((s, stageIndex) => {
    const stage = plan.stages.find((x) => x.id === s.id);
    if (!stage || !s.refs) return;
    for (const [role, text] of Object.entries(s.refs)) {
      const part = stage.parts[role];
      for (const ref of String(text)
        .split(/[\s/,;]+/)
        .filter(Boolean)) {
        out.push({
          ref: ref.toUpperCase(),
          stage: stage.id,
          stageIndex,
          role,
          text: part?.text ?? null,
          nominal: part?.nominal ?? null,
          tol: part?.tol ?? null,
          unit: part?.unit ?? null,
        });
      }
    }
  });
  return out;
}

/** Read a BOM value as a value of `unit`: `10K`, `4.7uF`, `4u7`, `10K 1%`, `100nF/50V`, `10k X7R`. */
export function readBomValue(
  text: string,
  unit: Unit,
  tolText: string | null,
): { ok: true; value: number; tol: number | null; text: string } | { ok: false; message: string } {
  const candidates = [text, text.split('/')[0] ?? '', text.split(/\s+/)[0] ?? ''].map((t) => t.trim()).filter((t, i, all) => t !== '' && all.indexOf(t) === i);
  for (const candidate of candidates) {
    const parsed = parseValue(candidate, { expected: unit, allowTolerance: true });
    if (parsed.ok && parsed.unit === unit && Number.isFinite(parsed.value)) {
      let tol = parsed.tol ?? null;
      if (tolText !== null) {
        const t = parseValue(tolText.includes('%') ? tolText : `${tolText}%`, { expected: '1', allowTolerance: false });
        if (t.ok) tol = t.value;
      }
      const bare = candidate.replace(/\s*±?\s*\d+(?:\.\d+)?\s*%$/, '');
      return { ok: true, value: parsed.value, tol, text: bare };
    }
  }
  const first = parseValue(text, { expected: unit, allowTolerance: true });
  return {
    ok: false,
    message: first.ok
      ? `${JSON.stringify(text)} is not ${unit === 'Ω' ? 'a resistance' : unit === 'F' ? 'a capacitance' : `a value in ${unit}`}`
      : first.message,
  };
}

const pct = (tol: number) => `${+(tol * 100).toFixed(3)}%`;

/** Match the BOM to the plan's refs: differences, refs on one side only, BOM values that cannot be read. */
export function reconcileBom(plan: Plan, bom: Bom): BomReport {
  const refs = planRefs(plan);
  const byRef = new Map(refs.map((r) => [r.ref, r] as const));
  const bomByRef = new Map<string, BomEntry>();
  for (const e of bom.entries) if (!bomByRef.has(e.ref)) bomByRef.set(e.ref, e);
  const differences: BomDifference[] = [];
  const unreadable: { ref: string; line: number; message: string }[] = bom.problems.map((p) => ({ ref: '', line: p.line, message: p.message }));
  let same = 0;
  const seenParts = new Set<string>();
  for (const r of refs) {
    const e = bomByRef.get(r.ref);
    if (!e || r.unit === null || r.nominal === null || r.text === null) continue;
    const part = `${r.stage}.${r.role}`;
    const read = readBomValue(e.value, r.unit, e.tol);
    if (!read.ok) {
      unreadable.push({ ref: r.ref, line: e.line, message: read.message });
      continue;
    }
    const valueDiffers = Math.abs(read.value - r.nominal) > 1e-9 * Math.max(Math.abs(r.nominal), 1e-30);
    const tolDiffers = read.tol !== null && r.tol !== null && Math.abs(read.tol - r.tol) > 1e-12;
    // Two designators of one part (a zener pair) are one difference.
    if (!valueDiffers && !tolDiffers) {
      same++;
      continue;
    }
    if (seenParts.has(part)) continue;
    seenParts.add(part);
    const tol = read.tol ?? r.tol;
    const write = tol !== null && tol > 0 ? `${read.text} ${pct(tol)}` : read.text;
    differences.push({
      ref: r.ref,
      part,
      plan: r.text,
      bom: `${e.value}${e.tol ? ` ${e.tol}` : ''} (${formatValue(read.value, r.unit)})`,
      write,
      path: ['stages', r.stageIndex, ...rolePath(r.role)],
    });
  }
  const onlyInPlan = refs.filter((r) => !bomByRef.has(r.ref));
  const onlyInBom = [...bomByRef.values()].filter((e) => !byRef.has(e.ref));
  return { differences, same, onlyInPlan, onlyInBom, unreadable };
}
