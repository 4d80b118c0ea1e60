import { StageParseError } from '../circuit/errors.js';
import { stageKinds } from '../circuit/registry.js';
import type { StageKind } from '../circuit/types.js';

/**
 * A plan being written (the plan editor's model): the raw plan JSON as an
 * object, changed only through the operations below, each returning a new
 * draft (the old one is never touched, so undo and "unsaved changes" are a
 * comparison away). Keys the editor does not know are kept where they are.
 */
export type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
export type JsonObject = { [key: string]: Json };
/** A JSON path as keys: `['stages', 1, 'parts', 'Rt']`. */
export type PathKeys = readonly (string | number)[];

export type Draft = JsonObject;

/**
 * A new plan's values (common practice, no source): a ±12 V split supply at
 * 5 %, a general-purpose op-amp, a bench meter's and counter's usual accuracy,
 * a 50 mA first-power limit. Invented defaults; the technician edits them.
 */
export function newDraft(id = 'new-board'): Draft {
  return {
    plan: id,
    title: 'New board (invented values, edit me)',
    rails: [
      { id: '+12V', nominal: '12 V', tol: '5%' },
      { id: '-12V', nominal: '-12 V', tol: '5%' },
    ],
    idleCurrent: { max: '50 mA' },
    opamp: { gbw: '1 MHz', slew: '0.5 V/us', headroom: '1.5 V', maxSupply: '15 V' },
    uncertainty: { V: '0.5% + 2 mV', A: '1% + 0.1 mA', Hz: '0.01%', ohm: '1% + 1 ohm' },
    stages: [],
  };
}

/** Read a plan's text into a draft; throws a SyntaxError when it is not a JSON object. */
export function parseDraft(text: string): Draft {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const json = JSON.parse(body) as Json;
  if (json === null || typeof json !== 'object' || Array.isArray(json)) throw new SyntaxError('a plan is a JSON object');
  return json;
}

/** `stages[1].parts.Rt` or `checkUncertainty["a.b"]` → keys. */
export function pathKeys(path: string): (string | number)[] {
  const keys: (string | number)[] = [];
  const re = /([A-Za-z_$][\w$-]*)|\[(\d+)\]|\["((?:[^"\\]|\\.)*)"\]/g;
  for (const m of path.matchAll(re)) {
    if (m[1] !== undefined) keys.push(m[1]);
    else if (m[2] !== undefined) keys.push(Number(m[2]));
    else if (m[3] !== undefined) keys.push(JSON.parse(`"${m[3]}"`) as string);
  }
  return keys;
}

export function getAt(json: Json | undefined, path: PathKeys): Json | undefined {
  let v: Json | undefined = json;
  for (const key of path) {
    if (v === null || typeof v !== 'object' || v === undefined) return undefined;
    v = Array.isArray(v) ? (typeof key === 'number' ? v[key] : undefined) : (v as JsonObject)[String(key)];
  }
  return v;
}

/**
 * Set (or with `undefined`, remove) the value at a path, creating objects on
 * the way; an emptied object left behind by a removal is removed too (a stage
 * without refs has no `"refs": {}`). Keys keep their place; a new key goes last.
 */
export function setAt(draft: Draft, path: PathKeys, value: Json | undefined): Draft {
  return (setIn(draft, path, value) ?? {}) as Draft;
}

function setIn(node: Json | undefined, path: PathKeys, value: Json | undefined): Json | undefined {
  const [key, ...rest] = path;
  if (key === undefined) return value;
  if (Array.isArray(node) && typeof key === 'number') {
    const copy = [...node];
    const next = setIn(copy[key], rest, value);
    if (next === undefined) copy.splice(key, 1);
    else copy[key] = next;
    return copy;
  }
  const obj: JsonObject = node !== null && typeof node === 'object' && !Array.isArray(node) ? { ...node } : {};
  const name = String(key);
  const next = setIn(obj[name], rest, value);
  if (next === undefined || (rest.length > 0 && isEmptyObject(next))) delete obj[name];
  else obj[name] = next;
  return obj;
}

function isEmptyObject(v: Json): boolean {
  return v !== null && typeof v === 'object' && !Array.isArray(v) && Object.keys(v).length === 0;
}

export function stagesOf(draft: Draft): JsonObject[] {
  const s = draft['stages'];
  return Array.isArray(s) ? s.filter((x): x is JsonObject => x !== null && typeof x === 'object' && !Array.isArray(x)) : [];
}

export function railsOf(draft: Draft): JsonObject[] {
  const r = draft['rails'];
  return Array.isArray(r) ? r.filter((x): x is JsonObject => x !== null && typeof x === 'object' && !Array.isArray(x)) : [];
}

/** A stage id not yet used: `gain`, `gain2`, … */
export function freeStageId(draft: Draft, base: string): string {
  const used = new Set(stagesOf(draft).map((s) => s['id']));
  const stem = base.replace(/[^A-Za-z0-9_-]/g, '').replace(/^[^A-Za-z]+/, '') || 'stage';
  if (!used.has(stem)) return stem;
  for (let n = 2; ; n++) if (!used.has(`${stem}${n}`)) return `${stem}${n}`;
}

/** The example value at the end of a kind's "missing" message (`e.g. "4k7 1%"`, `write "sine" or …`, `e.g. [{…}]`). */
export function exampleFrom(message: string): Json | undefined {
  const eg = message.indexOf('e.g. ');
  const at = eg >= 0 ? eg + 5 : message.indexOf('write ') >= 0 ? message.indexOf('write ') + 6 : -1;
  if (at < 0) return undefined;
  const rest = message.slice(at);
  const bracket = rest.match(/^(\[.*\]|\{.*\})/);
  if (bracket?.[1]) {
    try {
      return JSON.parse(bracket[1]) as Json;
    } catch {
      // not JSON after all: fall through to the first literal
    }
  }
  const literal = rest.match(/^("(?:[^"\\]|\\.)*"|-?\d+(?:\.\d+)?)/);
  if (!literal?.[1]) return undefined;
  return JSON.parse(literal[1]) as Json;
}

/**
 * A new stage of `kind` that its own parser accepts: starting from the id
 * and kind, every key the kind says is missing is filled with the example its
 * message gives (a rail setting with the plan's first rail), so the kind
 * module alone decides what a stage needs; no kind is named here.
 */
export function stageTemplate(
  kind: string,
  id: string,
  railIds: readonly string[],
  kinds: Readonly<Record<string, StageKind<unknown>>> = stageKinds,
): JsonObject {
  const module = kinds[kind];
  let json: JsonObject = { id, kind };
  if (!module) return json;
  const railKey = module.traits?.railSetting;
  if (railKey && railIds[0] !== undefined) json = { ...json, [railKey]: railIds[0] };
  for (let i = 0; i < 24; i++) {
    try {
      module.parse({ json, path: 'stage' }, 'new stage');
      return json;
    } catch (error) {
      if (!(error instanceof StageParseError) || !/^(missing|is empty)/.test(error.detail)) return json;
      // A nested object the kind needs (`parts`) starts empty; its own parts are asked for next.
      const example = exampleFrom(error.detail) ?? (/needs "/.test(error.detail) ? {} : undefined);
      if (example === undefined) return json;
      const keys = pathKeys(error.path).slice(1);
      if (keys.length === 0 || (getAt(json, keys) !== undefined && !/^is empty/.test(error.detail))) return json;
      json = setAt(json, keys, example) as JsonObject;
    }
  }
  return json;
}

/** Add a stage of `kind` at the end, wired to the first output of the stage before it when the kind takes an input. */
export function addStage(draft: Draft, kind: string, kinds: Readonly<Record<string, StageKind<unknown>>> = stageKinds): Draft {
  const module = kinds[kind];
  const stages = stagesOf(draft);
  const id = freeStageId(draft, kind.split('-')[0] ?? 'stage');
  let stage = stageTemplate(
    kind,
    id,
    railsOf(draft).map((r) => String(r['id'])),
    kinds,
  );
  const last = [...stages].reverse().find((s) => (kinds[String(s['kind'])]?.outputs.length ?? 0) > 0);
  if (module?.needsInput && last) {
    const out = kinds[String(last['kind'])]?.outputs[0];
    stage = orderStage({ ...stage, input: `${String(last['id'])}.${out}` });
  }
  return { ...draft, stages: [...(Array.isArray(draft['stages']) ? draft['stages'] : []), stage] };
}

export function removeAt(draft: Draft, list: 'stages' | 'rails', index: number): Draft {
  const items = Array.isArray(draft[list]) ? [...(draft[list] as Json[])] : [];
  if (index < 0 || index >= items.length) return draft;
  items.splice(index, 1);
  return { ...draft, [list]: items };
}

/** Move a stage up (−1) or down (+1); the same draft at either end. */
export function moveStage(draft: Draft, index: number, delta: -1 | 1): Draft {
  const items = Array.isArray(draft['stages']) ? [...draft['stages']] : [];
  const to = index + delta;
  if (index < 0 || index >= items.length || to < 0 || to >= items.length) return draft;
  const [item] = items.splice(index, 1);
  items.splice(to, 0, item as Json);
  return { ...draft, stages: items };
}

export function addRail(draft: Draft): Draft {
  const used = new Set(railsOf(draft).map((r) => r['id']));
  let n = 5;
  while (used.has(`+${n}V`)) n++;
  return { ...draft, rails: [...(Array.isArray(draft['rails']) ? draft['rails'] : []), { id: `+${n}V`, nominal: `${n} V`, tol: '5%' }] };
}

/** Wire a stage's input (`osc.triangle`), or unwire it with undefined. */
export function setInput(draft: Draft, index: number, input: string | undefined): Draft {
  const next = setAt(draft, ['stages', index, 'input'], input);
  const stage = stagesOf(next)[index];
  return stage ? setAt(next, ['stages', index], orderStage(stage)) : next;
}

export function setTestPoint(draft: Draft, index: number, output: string, testPoint: string | undefined): Draft {
  return setAt(draft, ['stages', index, 'testPoints', output], testPoint?.trim() || undefined);
}

export function setRef(draft: Draft, index: number, role: string, ref: string | undefined): Draft {
  return setAt(draft, ['stages', index, 'refs', role], ref?.trim() || undefined);
}

/** The upstream outputs a stage may take as input: `<stage>.<output>` of every other stage. */
export function inputChoices(draft: Draft, index: number, kinds: Readonly<Record<string, StageKind<unknown>>> = stageKinds): string[] {
  return stagesOf(draft).flatMap((s, i) => (i === index ? [] : (kinds[String(s['kind'])]?.outputs ?? []).map((o) => `${String(s['id'])}.${o}`)));
}

// Key order of a saved plan: the contract keys in DESIGN §3's order, then anything else as it was.
const topOrder = [
  '$schema',
  'plan',
  'title',
  'note',
  'rails',
  'idleCurrent',
  'railShortMin',
  'opamp',
  'temperature',
  'uncertainty',
  'checkUncertainty',
  'decimalComma',
  'stages',
];
const railOrder = ['id', 'nominal', 'tol', 'testPoint'];
const stageFirst = ['id', 'kind', 'input'];
const stageLast = ['testPoints', 'refs'];

function ordered(obj: JsonObject, first: readonly string[], last: readonly string[] = []): JsonObject {
  const out: JsonObject = {};
  for (const k of first) if (k in obj) out[k] = obj[k] as Json;
  for (const k of Object.keys(obj)) if (!first.includes(k) && !last.includes(k)) out[k] = obj[k] as Json;
  for (const k of last) if (k in obj) out[k] = obj[k] as Json;
  return out;
}

function orderStage(stage: JsonObject): JsonObject {
  return ordered(stage, stageFirst, stageLast);
}

/** The draft with its keys in the plan's usual order (unknown keys kept, after the known ones). */
export function orderDraft(draft: Draft): Draft {
  const top = ordered(draft, topOrder);
  if (Array.isArray(top['rails']))
    top['rails'] = top['rails'].map((r) => (r !== null && typeof r === 'object' && !Array.isArray(r) ? ordered(r, railOrder) : r));
  if (Array.isArray(top['stages'])) top['stages'] = top['stages'].map((s) => (s !== null && typeof s === 'object' && !Array.isArray(s) ? orderStage(s) : s));
  return top;
}

/** Lines are kept to this many columns: a short object or list stays on one line (a rail, a stage's parts). */
const lineWidth = 100;

/**
 * The plan as stable, readable JSON: two-space indent, keys in the plan's
 * usual order, short objects and lists on one line (`{"id": "+12V", …}`), a
 * final newline. The same draft always gives the same text.
 */
export function serialiseDraft(draft: Draft): string {
  return `${format(orderDraft(draft), '', 'top')}\n`;
}

function inline(v: Json): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v);
  if (Array.isArray(v)) return `[${v.map(inline).join(', ')}]`;
  return `{${Object.entries(v)
    .map(([k, x]) => `${JSON.stringify(k)}: ${inline(x)}`)
    .join(', ')}}`;
}

/** Where a value sits: the plan, its rail and stage lists and each stage are always one key a line (a plan reads stage by stage). */
type Place = 'top' | 'rails' | 'stages' | 'stage' | 'free';

function format(v: Json, indent: string, place: Place): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v);
  const entries = Array.isArray(v) ? v.map((x) => ['', x] as const) : Object.entries(v);
  if (entries.length === 0) return Array.isArray(v) ? '[]' : '{}';
  const one = inline(v);
  if (place === 'free' && indent.length + one.length + 24 <= lineWidth) return one;
  const inner = `${indent}  `;
  const childPlace = (k: string): Place => (place === 'top' && (k === 'rails' || k === 'stages') ? k : place === 'stages' ? 'stage' : 'free');
  const lines = entries.map(([k, x]) => `${inner}${Array.isArray(v) ? '' : `${JSON.stringify(k)}: `}${format(x, inner, childPlace(k))}`);
  return `${Array.isArray(v) ? '[' : '{'}\n${lines.join(',\n')}\n${indent}${Array.isArray(v) ? ']' : '}'}`;
}
