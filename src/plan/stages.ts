import type { OpampModel, PartValue, StageKind } from '../circuit/types.js';
import { PlanError, planAttempt } from './errors.js';
import { StageParseError } from '../circuit/errors.js';
import { checkTolerance, readValue } from './values.js';
import { type OpampSpec, readOpampSpec } from './active-spread.js';
import type { InputRef, PlanStage } from './types.js';
import type { z } from 'zod';
import type { stageSchema } from './schema.js';

type RawStageJson = z.infer<typeof stageSchema>;

/**
 * An external load the plan hangs on an output (`"loads": {"out": "600 ohm"}`)
 * becomes a toleranced part of its stage, role `loads.<output>`: it varies with
 * the rest and the chain adds it to that output's load.
 */
export const externalLoadPrefix = 'loads.';

function quoteList(items: readonly string[]): string {
  return items.map((s) => JSON.stringify(s)).join(', ');
}

/** The JSON path of a part role: `stages[0].parts.Rt`, or `stages[1].clamp.vz` for settings. */
function rolePath(stagePath: string, json: Readonly<Record<string, unknown>>, role: string): string {
  const parts = json.parts;
  if (parts && typeof parts === 'object' && Object.hasOwn(parts, role)) return `${stagePath}.parts.${role}`;
  return /^[A-Za-z_]/.test(role) ? `${stagePath}.${role}` : `${stagePath}${role}`;
}

/**
 * Resolve every stage of a plan: its kind, its parts (the kind's own `parse`),
 * its op-amp, its input and test points; then order the stages so that every
 * input comes before its user (stable: plan order wherever the chain allows).
 */
export function resolveStages(
  raws: readonly RawStageJson[],
  kinds: Readonly<Record<string, StageKind<unknown>>>,
  planOpamp: OpampModel | OpampSpec,
  file: string,
  railIds: readonly string[] = [],
  problems?: PlanError[],
): PlanStage[] {
  // A bare model (callers from before spreads) is an exact op-amp.
  const planSpec: OpampSpec = 'model' in planOpamp ? planOpamp : { model: planOpamp, spread: {} };
  // With `problems`, a stage with a mistake is noted there and left out, and the others are
  // still checked (`plan check`: every problem at once); without it the first mistake throws.
  const attempt = planAttempt(problems);
  const seen = new Map<string, number>();
  const skipped = new Set<number>();
  raws.forEach((raw, i) => {
    const ok = attempt(() => {
      if (raw.id === 'rails')
        throw new PlanError(file, `stages[${i}].id`, '"rails" is reserved for the supply checks (rails.<id>.dc); name the stage otherwise');
      const first = seen.get(raw.id);
      if (first !== undefined)
        throw new PlanError(file, `stages[${i}].id`, `duplicate stage id ${JSON.stringify(raw.id)} (also stages[${first}]); every stage needs its own id`);
      seen.set(raw.id, i);
      return true;
    });
    if (!ok) skipped.add(i);
  });

  const failedIds = new Set<string>();
  const built = raws.flatMap((raw, i) => {
    if (skipped.has(i)) return [];
    const stage = attempt(() => buildStage(raw, i));
    if (!stage) failedIds.add(raw.id);
    return stage ? [stage] : [];
  });

  const byId = new Map(built.map((s) => [s.id, s] as const));
  const resolved: PlanStage[] = built.flatMap((s) => {
    const { inputText, ...stage } = s;
    if (inputText === undefined) return [stage];
    // An input from a stage that already has a mistake is not a second mistake.
    if (problems && failedIds.has(inputText.split('.')[0] ?? '')) return [];
    const input = attempt(() => resolveInput(inputText, s, byId, file));
    return input ? [{ ...stage, input }] : [];
  });
  const ordered = attempt(() => chainOrder(resolved, file));
  return ordered ?? [];

  function buildStage(raw: RawStageJson, i: number): PlanStage & { inputText?: string } {
    const path = `stages[${i}]`;
    const module = kinds[raw.kind];
    if (!module) {
      throw new PlanError(file, `${path}.kind`, `unknown stage kind ${JSON.stringify(raw.kind)}; the known kinds are ${quoteList(Object.keys(kinds).sort())}`);
    }
    // A kind fed from a rail names the settings key (its `railSetting` trait, e.g. a divider's
    // `from`, DESIGN §3); the kind cannot see the rails, so check the id here.
    const railKey = module.traits?.railSetting;
    const railText = railKey === undefined ? undefined : (raw as Readonly<Record<string, unknown>>)[railKey];
    if (railKey !== undefined && typeof railText === 'string' && railIds.length > 0 && !railIds.includes(railText)) {
      throw new PlanError(file, `${path}.${railKey}`, `${JSON.stringify(railText)} is not a rail of this plan; the rails are ${quoteList(railIds)}`);
    }
    let parsed: ReturnType<typeof module.parse>;
    try {
      parsed = module.parse({ json: raw as Readonly<Record<string, unknown>>, path }, file);
    } catch (error) {
      // A kind's own parse error carries the path and the remedy; the plan adds nothing but its class.
      if (error instanceof StageParseError) throw new PlanError(error.file, error.path, error.detail);
      throw error;
    }
    const parts: Record<string, PartValue> = {};
    for (const [role, part] of Object.entries(parsed.parts)) {
      const where = rolePath(path, raw, role);
      checkTolerance(part.tol, part.text, file, where);
      if (!Number.isFinite(part.nominal)) throw new PlanError(file, where, `${JSON.stringify(part.text)} is not a finite value`);
      parts[role] = part;
    }
    for (const [output, text] of Object.entries(raw.loads ?? {})) {
      const where = `${path}.loads.${output}`;
      if (!module.outputs.includes(output)) {
        throw new PlanError(file, where, `${JSON.stringify(output)} is not an output of a ${raw.kind} stage; its outputs are ${quoteList(module.outputs)}`);
      }
      const v = readValue(text, 'Ω', file, where);
      if (!(v.value > 0)) throw new PlanError(file, where, `${JSON.stringify(text)} must be above zero; write the load's resistance, e.g. "600 ohm 5%"`);
      parts[`${externalLoadPrefix}${output}`] = { nominal: v.value, tol: v.tol, unit: 'Ω', text: v.text };
    }
    const opampSpec = readOpampSpec(raw.opamp, planSpec, file, `${path}.opamp`);
    const testPoints: Record<string, string> = { ...(raw.testPoints ?? {}) };
    const checkKeys = module.checks(parsed.settings).map((c) => c.key);
    for (const key of Object.keys(testPoints)) {
      if (!module.outputs.includes(key) && !checkKeys.includes(key)) {
        throw new PlanError(
          file,
          `${path}.testPoints.${key}`,
          `${JSON.stringify(key)} is not an output or check of a ${raw.kind} stage; use one of ${quoteList([...module.outputs, ...checkKeys])}`,
        );
      }
    }
    const refs: Record<string, string> = { ...(raw.refs ?? {}) };
    const faultRoles = module.faults?.(parsed.settings).map((f) => f.role) ?? [];
    for (const key of Object.keys(refs)) {
      if (!(key in parts) && !faultRoles.includes(key)) {
        throw new PlanError(
          file,
          `${path}.refs.${key}`,
          `${JSON.stringify(key)} is not a part of this ${raw.kind} stage; use one of ${quoteList([...Object.keys(parts), ...faultRoles.filter((r) => !(r in parts))])}`,
        );
      }
    }
    if (module.needsInput && raw.input === undefined) {
      throw new PlanError(file, `${path}.input`, `a ${raw.kind} stage needs an input; write the upstream output, e.g. "input": "osc.triangle"`);
    }
    if (!module.needsInput && raw.input !== undefined) {
      throw new PlanError(file, `${path}.input`, `a ${raw.kind} stage takes no input; remove "input"`);
    }
    const base = {
      id: raw.id,
      kind: raw.kind,
      module,
      parts,
      settings: parsed.settings,
      testPoints,
      ...(Object.keys(refs).length > 0 ? { refs } : {}),
      opamp: opampSpec.model,
      opampSpread: opampSpec.spread,
      ...(raw.opamp ? { hasOwnOpamp: true } : {}),
      path,
    };
    return raw.input === undefined ? base : { ...base, inputText: raw.input };
  }
}

function resolveInput(text: string, stage: PlanStage, byId: ReadonlyMap<string, PlanStage>, file: string): InputRef {
  const where = `${stage.path}.input`;
  const dot = text.indexOf('.');
  const stageId = dot < 0 ? text : text.slice(0, dot);
  const source = byId.get(stageId);
  if (!source) {
    throw new PlanError(file, where, `${JSON.stringify(text)}: unknown stage ${JSON.stringify(stageId)}; the stages are ${quoteList([...byId.keys()])}`);
  }
  if (source.id === stage.id) throw new PlanError(file, where, `${JSON.stringify(text)}: a stage cannot take its own output as input`);
  const output = dot < 0 ? undefined : text.slice(dot + 1);
  if (output === undefined || !source.module.outputs.includes(output)) {
    throw new PlanError(
      file,
      where,
      `${JSON.stringify(text)}: ${output === undefined ? 'no output named' : `unknown output ${JSON.stringify(output)}`}; a ${source.kind} stage has ${quoteList(source.module.outputs.map((o) => `${source.id}.${o}`))}`,
    );
  }
  return { stage: source.id, output };
}

/** Topological order, stable to plan order; a cycle is a plan error naming the loop. */
function chainOrder(stages: readonly PlanStage[], file: string): PlanStage[] {
  const byId = new Map(stages.map((s) => [s.id, s] as const));
  const state = new Map<string, 'visiting' | 'done'>();
  const out: PlanStage[] = [];
  // Walks each stage's inputs upstream without recursion (a long chain must not
  // overflow the stack) and with one shared trail (copying it per step was quadratic).
  for (const start of stages) {
    const trail: PlanStage[] = [];
    let s: PlanStage | undefined = start;
    while (s && state.get(s.id) !== 'done') {
      if (state.get(s.id) === 'visiting') {
        const ids = trail.map((t) => t.id);
        const loop = [...ids.slice(ids.indexOf(s.id)), s.id];
        throw new PlanError(file, `${s.path}.input`, `the inputs form a loop (${loop.join(' → ')}); a signal chain must start at a stage without an input`);
      }
      state.set(s.id, 'visiting');
      trail.push(s);
      s = s.input ? byId.get(s.input.stage) : undefined;
    }
    for (let i = trail.length - 1; i >= 0; i--) {
      const done = trail[i] as PlanStage;
      state.set(done.id, 'done');
      out.push(done);
    }
  }
  return out;
}

/** Stage ids upstream of `id`, nearest first (its input stage, then that one's input, …). */
export function upstreamOf(stages: readonly PlanStage[], id: string): string[] {
  const byId = new Map(stages.map((s) => [s.id, s] as const));
  const out: string[] = [];
  let s = byId.get(id);
  while (s?.input && !out.includes(s.input.stage)) {
    out.push(s.input.stage);
    s = byId.get(s.input.stage);
  }
  return out;
}
