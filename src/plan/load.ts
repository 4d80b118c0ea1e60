import { createHash } from 'node:crypto';
import { defaultOpamp } from '../circuit/opamp.js';
import { stageKinds } from '../circuit/registry.js';
import type { StageKind } from '../circuit/types.js';
import { oneLine } from '../units/text.js';
import type { UncertaintySpec } from '../units/uncertainty.js';
import type { Unit } from '../units/unit.js';
import { planChecks } from './checks.js';
import { PlanError, planAttempt } from './errors.js';
import { findJsonFault } from './json-position.js';
import { type RawPlan, jsonPath, planSchema } from './schema.js';
import { resolveStages } from './stages.js';
import type { Plan, Rail } from './types.js';
import { readTolerance, readUncertainty, readValue } from './values.js';
import { defaultVos, readOpampSpec, readTemperatureRange } from './active-spread.js';
import { maxPlanBytes, maxStages, readPlanFile } from './read-file.js';

export { maxPlanBytes, maxStages };

/**
 * Below this rail-to-ground resistance, read unpowered, a rail counts as shorted
 * (common practice, no source: a rail that reads a few ohms is a short until
 * proven otherwise; 100 Ω leaves room for the bulk capacitors charging the meter).
 */
export const defaultRailShortMin = 100;

/** The longest list inside a stage (a shaper's `branches`, a manual stage's `checks`). */
export const maxStageList = 64;
/** The deepest nesting of objects and lists in a plan file. */
export const maxPlanDepth = 64;

/** Units of the plan's `uncertainty` map by key. */
const uncertaintyUnits: Readonly<Record<string, Unit>> = { V: 'V', A: 'A', Hz: 'Hz', ohm: 'Ω', s: 's', F: 'F', 'V/V': 'V/V', '1': '1' };

/**
 * Read and validate a plan file. Throws `PlanError` (file, JSON path, remedy) for
 * anything wrong. Messages name the file as given; `cwd` resolves a relative path.
 */
export async function loadPlanFile(file: string, options: { readonly cwd?: string } = {}): Promise<Plan> {
  const text = await readPlanFile(file, options);
  return loadPlanText(text, file);
}

/**
 * Validate a plan's text. `kinds` defaults to the registry; tests pass their own.
 * `hash` is the sha256 of the exact text, so a run can be tied to the plan it used.
 */
export function loadPlanText(text: string, file: string, kinds: Readonly<Record<string, StageKind<unknown>>> = stageKinds): Plan {
  return readPlan(text, file, kinds) as Plan;
}

/**
 * Every problem of a plan at once (`probebook plan check`, the plan editor's
 * save), each a PlanError with its JSON path and remedy; empty when the plan
 * loads. A JSON syntax error or a wrong shape stops the search there (what
 * follows cannot be read); otherwise each rail, setting and stage is checked
 * on its own, and a stage with a mistake is left out of the later checks.
 */
export function checkPlanText(text: string, file: string, kinds: Readonly<Record<string, StageKind<unknown>>> = stageKinds): PlanError[] {
  const problems: PlanError[] = [];
  try {
    readPlan(text, file, kinds, problems);
  } catch (error) {
    if (!(error instanceof PlanError)) throw error;
    problems.push(error);
  }
  return problems;
}

function readPlan(text: string, file: string, kinds: Readonly<Record<string, StageKind<unknown>>>, problems?: PlanError[]): Plan | null {
  const attempt = planAttempt(problems);
  if (text.length > maxPlanBytes) throw new PlanError(file, '', `is ${(text.length / 1e6).toFixed(1)} MB; a plan is at most ${maxPlanBytes / 1e6} MB`);
  const json = parseJson(text, file);
  checkSize(json, file);
  const result = planSchema.safeParse(json);
  if (!result.success) {
    const issues = result.error.issues;
    // The shape is wrong: every issue is a problem, and nothing after can be read.
    if (problems && issues.length > 0) {
      for (const issue of issues) problems.push(new PlanError(file, jsonPath(issue.path), describeIssue(issue, json)));
      return null;
    }
    const first = issues[0];
    if (!first) throw new PlanError(file, '', 'is not a valid plan');
    throw new PlanError(file, jsonPath(first.path), describeIssue(first, json));
  }
  const raw = result.data;

  const rails = problems
    ? raw.rails.flatMap((r, i) => attempt(() => readRails({ ...raw, rails: raw.rails.slice(0, i + 1) }, file).slice(i)) ?? [])
    : readRails(raw, file);
  const fallbackSpec = { model: defaultOpamp, spread: { vos: defaultVos } };
  const opampSpec = attempt(() => readOpampSpec(raw.opamp, fallbackSpec, file, 'opamp')) ?? fallbackSpec;
  const opampBase = opampSpec.model;
  const temperature = attempt(() => readTemperatureRange(raw.temperature, file));
  // A rail with a mistake is still a rail of the plan for the stages' `from` (not a second mistake).
  const stages = resolveStages(raw.stages, kinds, opampSpec, file, problems ? raw.rails.map((r) => r.id) : rails.map((r) => r.id), problems);

  const uncertainty: Partial<Record<Unit, UncertaintySpec>> = {};
  for (const [key, spec] of Object.entries(raw.uncertainty ?? {})) {
    const unit = uncertaintyUnits[key];
    if (unit && spec !== undefined) {
      const read = attempt(() => readUncertainty(spec, unit, file, `uncertainty.${key}`));
      if (read) uncertainty[unit] = read;
    }
  }

  const checks = planChecks({ rails, stages });
  const checkUncertainty: Record<string, UncertaintySpec> = {};
  for (const [id, spec] of Object.entries(raw.checkUncertainty ?? {})) {
    attempt(() => {
      const check = checks.find((c) => c.check === id);
      if (!check) {
        // A check of a stage that already has a mistake is not a second mistake.
        if (problems && problems.length > 0) return;
        const sample = checks
          .slice(0, 6)
          .map((c) => JSON.stringify(c.check))
          .join(', ');
        throw new PlanError(file, `checkUncertainty[${JSON.stringify(id)}]`, `no check ${JSON.stringify(id)} in this plan; check ids look like ${sample}`);
      }
      checkUncertainty[id] = readUncertainty(spec, check.unit, file, `checkUncertainty[${JSON.stringify(id)}]`);
    });
  }

  let railShortMin = defaultRailShortMin;
  const shortText = raw.railShortMin;
  if (shortText !== undefined) {
    attempt(() => {
      railShortMin = readValue(shortText, 'Ω', file, 'railShortMin', { allowTolerance: false }).value;
      if (!(railShortMin > 0)) throw new PlanError(file, 'railShortMin', 'must be a resistance above zero, e.g. "100 ohm"');
    });
  }

  const base = {
    plan: raw.plan,
    // A title reaches every screen and report: one clean line.
    title: oneLine(raw.title),
    file,
    hash: createHash('sha256').update(text, 'utf8').digest('hex'),
    text,
    rails,
    railShortMin,
    opamp: opampBase,
    opampSpread: opampSpec.spread,
    ...(temperature ? { temperature } : {}),
    uncertainty,
    checkUncertainty,
    stages,
  };
  const withComma = raw.decimalComma === true ? { ...base, decimalComma: true } : base;
  const withNote = raw.note === undefined ? withComma : { ...withComma, note: raw.note };
  let idle: number | undefined;
  if (raw.idleCurrent !== undefined) {
    const max = raw.idleCurrent.max;
    idle = attempt(() => {
      const v = readValue(max, 'A', file, 'idleCurrent.max', { allowTolerance: false }).value;
      if (!(v > 0)) throw new PlanError(file, 'idleCurrent.max', 'must be a current above zero, e.g. "45 mA"');
      return v;
    });
  }
  if (problems && problems.length > 0) return null;
  return idle === undefined ? withNote : { ...withNote, idleCurrentMax: idle };
}

/** Refuse plans beyond the size limits before any stage is read, naming the place. */
function checkSize(json: unknown, file: string): void {
  if (json === null || typeof json !== 'object') return;
  const stages = (json as { stages?: unknown }).stages;
  if (!Array.isArray(stages)) return;
  if (stages.length > maxStages)
    throw new PlanError(file, 'stages', `${stages.length} stages; a plan holds at most ${maxStages} (split the board into several plans)`);
  stages.forEach((stage: unknown, i) => {
    if (stage === null || typeof stage !== 'object') return;
    for (const [key, value] of Object.entries(stage)) {
      if (Array.isArray(value) && value.length > maxStageList) {
        throw new PlanError(file, `stages[${i}].${key}`, `${value.length} entries; a stage holds at most ${maxStageList} (e.g. 64 branches per shaper)`);
      }
    }
  });
}

/** The deepest nesting of `{`/`[` outside strings, in one pass, stopping once past `limit`. */
export function nestingDepth(text: string, limit: number): number {
  let depth = 0;
  let deepest = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c)
        i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x7b || c === 0x5b) {
      depth++;
      if (depth > deepest) deepest = depth;
      if (deepest > limit) return deepest;
    } else if (c === 0x7d || c === 0x5d) depth--;
  }
  return deepest;
}

function parseJson(text: string, file: string): unknown {
  // Editors on some systems write a byte-order mark; it is not part of the JSON.
  const body = text.charCodeAt(0) === 0xfeff ? ` ${text.slice(1)}` : text;
  // Checked before parsing: the fault finder below recurses once per level.
  if (nestingDepth(body, maxPlanDepth) > maxPlanDepth)
    throw new PlanError(file, '', `is nested more than ${maxPlanDepth} levels deep; a plan is a few levels of objects and lists`);
  try {
    return JSON.parse(body);
  } catch {
    const fault = findJsonFault(body);
    if (!fault) throw new PlanError(file, '', 'is not valid JSON');
    throw new PlanError(file, `line ${fault.line}, column ${fault.column}`, `not valid JSON; expected ${fault.expected}`);
  }
}

interface Issue {
  readonly code: string;
  readonly path: readonly PropertyKey[];
  readonly message: string;
  readonly keys?: readonly string[];
}

function valueAt(json: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = json;
  for (const key of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[key];
  }
  return v;
}

const topKeys = Object.keys(planSchema.shape).filter((k) => k !== '$schema');

/** Keys of the nested strict objects, by path (list indexes as [0]), for "unknown key" messages. */
const nestedKeys: Readonly<Record<string, readonly string[]>> = {
  'rails[0]': ['id', 'nominal', 'tol', 'testPoint'],
  idleCurrent: ['max'],
  opamp: ['gbw', 'slew', 'headroom', 'maxSupply', 'aol', 'vos', 'ib'],
  'stages[0].opamp': ['gbw', 'slew', 'headroom', 'maxSupply', 'aol', 'vos', 'ib'],
  temperature: ['min', 'max'],
  uncertainty: ['V', 'A', 'Hz', 'ohm', 's', 'F', 'V/V', '1'],
};

function describeIssue(issue: Issue, json: unknown): string {
  if (issue.code === 'unrecognized_keys') {
    const keys = (issue.keys ?? []).map((k) => JSON.stringify(k)).join(', ');
    const where = jsonPath(issue.path.map((k) => (typeof k === 'number' ? 0 : k)));
    const known = issue.path.length === 0 ? topKeys : nestedKeys[where];
    const allowed = known ? `; ${issue.path.length === 0 ? 'a plan has' : 'the keys here are'} ${known.join(', ')}` : '';
    return `unknown key ${keys} (a typo?)${allowed}`;
  }
  if (issue.code === 'invalid_type' && issue.path.length > 0 && valueAt(json, issue.path) === undefined) {
    return `missing; ${issue.message}`;
  }
  if (issue.code === 'invalid_type' && issue.path.length === 0) return 'expected a JSON object with "plan", "title", "rails" and "stages"';
  return issue.message;
}

function readRails(raw: RawPlan, file: string): Rail[] {
  const rails: Rail[] = [];
  raw.rails.forEach((r, i) => {
    const path = `rails[${i}]`;
    const dup = rails.findIndex((x) => x.id === r.id);
    if (dup >= 0) throw new PlanError(file, `${path}.id`, `duplicate rail id ${JSON.stringify(r.id)} (also rails[${dup}])`);
    const nominal = readValue(r.nominal, 'V', file, `${path}.nominal`);
    if (nominal.value === 0) throw new PlanError(file, `${path}.nominal`, 'a rail of 0 V is ground; leave it out or give its voltage');
    let tol = nominal.tol;
    if (r.tol !== undefined) {
      if (nominal.tol !== 0) throw new PlanError(file, `${path}.tol`, 'the tolerance is written twice (in "nominal" and in "tol"); keep one');
      tol = readTolerance(r.tol, file, `${path}.tol`);
    }
    const rail: Rail = { id: r.id, nominal: nominal.value, tol, text: r.tol === undefined ? r.nominal : `${r.nominal} ${r.tol}` };
    rails.push(r.testPoint === undefined ? rail : { ...rail, testPoint: r.testPoint });
  });
  if (rails.length === 0) throw new PlanError(file, 'rails', 'a plan needs at least one rail, e.g. [{"id": "+12V", "nominal": "12 V", "tol": "3%"}]');
  return rails;
}
