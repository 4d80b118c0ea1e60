import { stageKinds } from '../../circuit/registry.js';
import type { StageKind } from '../../circuit/types.js';
import { type Draft, type Json, type JsonObject, type PathKeys, getAt, railsOf, stagesOf } from '../../plan/draft.js';
import type { Unit } from '../../units/unit.js';

/**
 * The plan editor's form as rows, built from the draft and the registry of
 * stage kinds (no kind is named here): what each row edits (its JSON path),
 * how (`text`, a `value` with a unit, raw `json`, an `input` chosen from the
 * upstream outputs, or an `action`), and the one-line explanation shown when
 * it is selected. Pure: the screen draws it, the tests read it.
 */
export type RowKind = 'text' | 'value' | 'json' | 'input' | 'action';

export interface Row {
  /** Unique and stable while the draft keeps its shape: the JSON path as text, or the action. */
  readonly key: string;
  readonly section: string;
  readonly label: string;
  readonly path: PathKeys;
  readonly kind: RowKind;
  readonly unit?: Unit;
  readonly help: string;
  /** An empty entry removes the key. */
  readonly isOptional?: boolean;
  readonly stageIndex?: number;
  readonly railIndex?: number;
  readonly action?: 'add-rail' | 'add-stage';
}

const board: readonly Omit<Row, 'key' | 'section'>[] = [
  { label: 'plan id', path: ['plan'], kind: 'text', help: 'the plan id: letters, digits, ".", "-", "_" (the log files a board under it), e.g. exciter-b' },
  { label: 'title', path: ['title'], kind: 'text', help: 'the board as people call it, with its revision, e.g. "Sensor exciter, rev B"' },
  {
    label: 'note',
    path: ['note'],
    kind: 'text',
    isOptional: true,
    help: 'free text shown with the targets (say here when values are invented); empty removes it',
  },
];

const limits: readonly Omit<Row, 'key' | 'section'>[] = [
  {
    label: 'idle current max',
    path: ['idleCurrent', 'max'],
    kind: 'value',
    unit: 'A',
    isOptional: true,
    help: 'first power goes through a current-limited supply set near this; above it the run says "power off"',
  },
  {
    label: 'op-amp GBW',
    path: ['opamp', 'gbw'],
    kind: 'value',
    unit: 'Hz',
    isOptional: true,
    help: 'gain-bandwidth product of the op-amp (data sheet, typical), e.g. "1 MHz" or "1 MHz 30%"',
  },
  {
    label: 'op-amp slew',
    path: ['opamp', 'slew'],
    kind: 'value',
    unit: 'V/s',
    isOptional: true,
    help: 'slew rate of the op-amp, e.g. "0.5 V/us": sets full-power bandwidth and square edges',
  },
  {
    label: 'op-amp headroom',
    path: ['opamp', 'headroom'],
    kind: 'value',
    unit: 'V',
    isOptional: true,
    help: 'how far the output stays from each rail, e.g. "1.5 V" (rail-to-rail parts: "0.1 V")',
  },
  {
    label: 'op-amp max supply',
    path: ['opamp', 'maxSupply'],
    kind: 'value',
    unit: 'V',
    isOptional: true,
    help: 'highest supply per rail the op-amp takes, e.g. "15 V"; a rail above it is a design warning',
  },
  {
    label: 'op-amp offset',
    path: ['opamp', 'vos'],
    kind: 'value',
    unit: 'V',
    isOptional: true,
    help: 'input offset voltage, the data sheet\'s ± maximum, e.g. "2 mV" (±5 mV when empty): moves every DC level',
  },
  {
    label: 'op-amp bias current',
    path: ['opamp', 'ib'],
    kind: 'value',
    unit: 'A',
    isOptional: true,
    help: 'input bias current, e.g. "80 nA 50%": flows through the resistors at the inputs',
  },
  {
    label: 'ambient min',
    path: ['temperature', 'min'],
    kind: 'text',
    isOptional: true,
    help: 'lowest ambient the board works in, e.g. "15 °C" (with max): diode drops follow it',
  },
  { label: 'ambient max', path: ['temperature', 'max'], kind: 'text', isOptional: true, help: 'highest ambient the board works in, e.g. "40 °C" (with min)' },
  {
    label: 'uncertainty V',
    path: ['uncertainty', 'V'],
    kind: 'text',
    isOptional: true,
    help: 'the voltmeter\'s uncertainty, relative + absolute, e.g. "0.5% + 2 mV": the guard band of every volt reading',
  },
  {
    label: 'uncertainty A',
    path: ['uncertainty', 'A'],
    kind: 'text',
    isOptional: true,
    help: 'the ammeter\'s uncertainty, e.g. "1% + 0.1 mA" (the idle current reading)',
  },
  { label: 'uncertainty Hz', path: ['uncertainty', 'Hz'], kind: 'text', isOptional: true, help: 'the counter\'s uncertainty, e.g. "0.01%"' },
  {
    label: 'uncertainty ohm',
    path: ['uncertainty', 'ohm'],
    kind: 'text',
    isOptional: true,
    help: 'the ohmmeter\'s uncertainty, e.g. "1% + 1 ohm" (rails to ground, unpowered)',
  },
];

/** Where a role's value sits in the stage: `clamp.vz` as written, a part under `parts`, a setting (`peak`, `vbe`) at the stage's top. */
export function rolePath(role: string, unit: Unit, stage: JsonObject): (string | number)[] {
  if (role.includes('.')) return role.split('.');
  const parts = stage['parts'];
  const isInParts = parts !== null && typeof parts === 'object' && !Array.isArray(parts) && role in parts;
  if (isInParts || (!(role in stage) && (unit === 'Ω' || unit === 'F' || unit === 'H'))) return ['parts', role];
  return [role];
}

const fixedStageKeys = new Set(['id', 'kind', 'input', 'parts', 'testPoints', 'refs']);

function stageRows(stage: JsonObject, i: number, kinds: Readonly<Record<string, StageKind<unknown>>>): Row[] {
  const id = String(stage['id'] ?? `stage ${i + 1}`);
  const kind = String(stage['kind'] ?? '');
  const module = kinds[kind];
  const section = `stage ${i + 1}: ${id}`;
  const at = (...rest: (string | number)[]): PathKeys => ['stages', i, ...rest];
  const row = (r: Omit<Row, 'key' | 'section' | 'stageIndex'>): Row => ({ ...r, key: JSON.stringify(r.path) + (r.action ?? ''), section, stageIndex: i });
  const rows: Row[] = [
    row({
      label: `▸ stage ${i + 1}`,
      path: at('id'),
      kind: 'text',
      help: module ? `${kind}: ${module.summary}` : `unknown kind ${JSON.stringify(kind)}: the kinds are ${Object.keys(kinds).join(', ')}`,
    }),
  ];
  if (!module) return [...rows, row({ label: 'kind', path: at('kind'), kind: 'json', help: `the stage kind, one of ${Object.keys(kinds).join(', ')}` })];
  if (module.needsInput || stage['input'] !== undefined) {
    rows.push(
      row({
        label: 'input',
        path: at('input'),
        kind: 'input',
        help: 'the upstream output this stage takes (←/→ or Enter to choose); signals flow down the chain',
      }),
    );
  }
  const covered = new Set<string>();
  for (const role of module.roles) {
    if (role.role.includes('[')) continue;
    const path = rolePath(role.role, role.unit, stage);
    covered.add(String(path[0]));
    rows.push(
      row({
        label: role.role,
        path: at(...path),
        kind: 'value',
        unit: role.unit,
        ...(role.optional ? { isOptional: true } : {}),
        help: `${role.description}${role.optional ? ' (optional: empty removes it)' : ''}, typed as at the bench, e.g. ${exampleFor(role.unit)}`,
      }),
    );
  }
  for (const role of module.roles) {
    if (role.role.includes('[')) continue;
    const group = role.role.includes('.') ? (role.role.split('.')[0] as string) : role.role;
    const key = `refs ${group}`;
    if (rows.some((r) => r.label === key)) continue;
    if (!role.role.includes('.') && rolePath(role.role, role.unit, stage)[0] !== 'parts') continue;
    rows.push(
      row({
        label: key,
        path: at('refs', group),
        kind: 'text',
        isOptional: true,
        help: `reference designator of ${group} as printed on the board (e.g. R17, C7, D3/D4); plan bom matches it`,
      }),
    );
  }
  for (const output of module.outputs) {
    rows.push(
      row({
        label: `TP ${output}`,
        path: at('testPoints', output),
        kind: 'text',
        isOptional: true,
        help: `test point where ${id}.${output} is probed, e.g. TP3 (a connector: J1)`,
      }),
    );
  }
  for (const key of Object.keys(stage)) {
    if (fixedStageKeys.has(key) || covered.has(key)) continue;
    rows.push(
      row({
        label: key,
        path: at(key),
        kind: 'json',
        help: `"${key}" of this ${kind} stage, as JSON (plain text for a word, e.g. +12V); see the kind's help with a`,
      }),
    );
  }
  return rows;
}

function exampleFor(unit: Unit): string {
  const examples: Partial<Record<Unit, string>> = { Ω: '4k7 1%', F: '22n 5%', V: '0.65 V 5%', Hz: '1 kHz 0.1%', A: '2.52n', 'V/V': '100 50%', '1': '0.5' };
  return examples[unit] ?? '1';
}

/** Every row of the form for this draft, in order: board, rails, limits, stages, then "add stage". */
export function editorRows(draft: Draft, kinds: Readonly<Record<string, StageKind<unknown>>> = stageKinds): Row[] {
  const rows: Row[] = board.map((r) => ({ ...r, key: JSON.stringify(r.path), section: 'board' }));
  for (const i of railsOf(draft).keys()) {
    const rail = (label: string, key: string, kind: RowKind, help: string, extra: Partial<Row> = {}): Row => ({
      key: JSON.stringify(['rails', i, key]),
      section: `rail ${i + 1}`,
      label,
      path: ['rails', i, key],
      kind,
      help,
      railIndex: i,
      ...extra,
    });
    rows.push(
      rail(`rail ${i + 1} id`, 'id', 'text', "the rail's name as on the board, e.g. +12V (d removes the rail)"),
      rail('  nominal', 'nominal', 'value', 'the rail voltage, signed, e.g. "-12 V" (a tolerance may follow: "12 V 3%")', { unit: 'V' }),
      rail('  tol', 'tol', 'text', 'the rail\'s tolerance, e.g. "3%" (or write it after the nominal)', { isOptional: true }),
      rail('  test point', 'testPoint', 'text', 'where the rail is probed, e.g. TP1', { isOptional: true }),
    );
  }
  rows.push({
    key: 'add-rail',
    section: 'rails',
    label: '+ add a rail (r)',
    path: ['rails'],
    kind: 'action',
    action: 'add-rail',
    help: 'add a supply rail; every plan needs at least one',
  });
  rows.push(...limits.map((r) => ({ ...r, key: JSON.stringify(r.path), section: 'limits' })));
  for (const [i, stage] of stagesOf(draft).entries()) rows.push(...stageRows(stage, i, kinds));
  rows.push({
    key: 'add-stage',
    section: 'stages',
    label: '+ add a stage (a)',
    path: ['stages'],
    kind: 'action',
    action: 'add-stage',
    help: 'pick a stage kind from the catalog; it is wired to the stage before it',
  });
  return rows;
}

/** The text a row shows (and starts its editor with): strings as written, anything else as JSON. */
export function rowText(draft: Draft, row: Row): string {
  if (row.kind === 'action') return '';
  const v = getAt(draft, row.path);
  if (v === undefined) return '';
  return typeof v === 'string' ? v : JSON.stringify(v);
}

/**
 * The row a plan problem belongs to: the one whose path is the longest
 * prefix of the problem's path (`stages[1].parts` → the stage's first row;
 * `stages` → "add a stage"); the first row for the file as a whole.
 */
export function rowForProblem(rows: readonly Row[], problem: PathKeys): number {
  let best = 0;
  let bestLength = -1;
  rows.forEach((row, i) => {
    const n = row.path.length;
    if (n > problem.length || n <= bestLength) return;
    if (row.path.every((k, j) => k === problem[j])) {
      best = i;
      bestLength = n;
    }
  });
  // Inside one stage or rail with no row of its own (`stages[1].parts`): that stage's or rail's first row.
  if (bestLength < 2 && typeof problem[1] === 'number') {
    const first = rows.findIndex((r) => r.path[0] === problem[0] && r.path[1] === problem[1]);
    if (first >= 0) return first;
  }
  return best;
}

/** Turn what was typed into the JSON to store: undefined removes the key. */
export function entryValue(row: Row, text: string, previous: Json | undefined): { value: Json | undefined } | { error: string } {
  const trimmed = text.trim();
  if (trimmed === '') return row.isOptional || row.kind === 'json' ? { value: undefined } : { value: '' };
  if (row.kind === 'json') {
    try {
      return { value: JSON.parse(trimmed) as Json };
    } catch {
      if (/^[[{"]/.test(trimmed)) return { error: 'not valid JSON: check the brackets, quotes and commas' };
      // A word (`+12V`, `diodes`) is taken as text.
      return { value: trimmed };
    }
  }
  // A dimensionless setting kept a plain number where it was one (`"hfe": 100`).
  if (typeof previous === 'number' && /^[+-]?\d+(\.\d+)?(e[+-]?\d+)?$/i.test(trimmed)) return { value: Number(trimmed) };
  return { value: trimmed };
}
