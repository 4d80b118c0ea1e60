import { StageParseError } from './errors.js';
import { parseValue } from '../units/parse.js';
import { type Unit, unitAliases } from '../units/unit.js';
import { list, onlyKeys, partAt, reader, type StageReader, textAt } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartValue, StageKind } from './types.js';

/**
 * Targets written by hand, for anything without a model (a reference voltage, a
 * relay's click, a bias current). Each entry of `checks[]` is either
 *
 *   { "id", "quantity", "unit", "nominal": "2.5 V", "tol": "2%" }   or
 *   { "id", "quantity", "unit", "min": "-5 mV", "max": "5 mV" }
 *
 * How the band is carried (for the tolerance engine, which only knows parts):
 *
 * - `nominal` with a percentage `tol` becomes a toleranced part with role
 *   `checks[i].nominal`; the check's value is that part, so the worst-case band
 *   is nominal·(1 ± tol) and the Monte Carlo spreads it like any part.
 * - `min`/`max` (and `nominal` with an absolute `tol` such as "50 mV", read as
 *   nominal ± 50 mV) becomes a part with role `checks[i].band`: a dimensionless
 *   position u with nominal 1 and tolerance 50 %, and the value is
 *   min + (max − min)·(u − 0.5). The tolerance box of u, 0.5 … 1.5, maps exactly
 *   onto min … max, and the nominal onto the middle, so a band around zero
 *   (an offset of −5 … +5 mV) works where a relative tolerance could not.
 *
 * No engine change is needed either way: worst case, Monte Carlo and the part
 * explanations treat the manual target like any other toleranced value.
 */
export interface ManualCheck {
  /** Check key (the check id is `<stage>.<key>`). */
  readonly key: string;
  readonly quantity: string;
  readonly unit: Unit;
  readonly instrument: CheckSpec['instrument'];
  readonly how: string;
  readonly role: string;
  /** Set for the min/max form: the band the position part maps onto. */
  readonly band?: { readonly min: number; readonly max: number };
}

export interface ManualSettings {
  readonly checks: readonly ManualCheck[];
}

/** Units a hand-written target may use, by the text a plan writes (`"V"`, `"mA"` is not a unit: `"A"`). */
function unitFrom(r: StageReader): Unit {
  const text = textAt(r, 'unit', true, '"V", "A", "Hz", "s", "ohm", "F", "W", "V/V" or "%"');
  if (text === '%' || text === '1') return '1';
  const unit = unitAliases[text] ?? unitAliases[text.toLowerCase()];
  if (!unit)
    throw new StageParseError(
      r.file,
      `${r.path}.unit`,
      `${JSON.stringify(text)} is not a unit; write "V", "A", "Hz", "s", "ohm", "F", "W", "V/V" or "%" (no prefix)`,
    );
  return unit;
}

/**
 * A hand-written check is answered by a scope capture when its id ends the way
 * the modelled kinds name the same figure (DESIGN §4: `.freq`, `.vpp`, `.duty`,
 * `.thd`, `.dc`) and its unit fits; the plan author chose the id, so it says so.
 */
const captureFigures: Readonly<Record<string, { readonly figure: NonNullable<CheckSpec['captureFigure']>; readonly unit: Unit }>> = {
  freq: { figure: 'frequency', unit: 'Hz' },
  vpp: { figure: 'vpp', unit: 'V' },
  duty: { figure: 'duty', unit: '1' },
  thd: { figure: 'thd', unit: '1' },
  dc: { figure: 'mean', unit: 'V' },
};

function captureFigureOf(c: ManualCheck): CheckSpec['captureFigure'] {
  const entry = captureFigures[c.key.split('.').pop() ?? ''];
  return entry && entry.unit === c.unit ? entry.figure : undefined;
}

const keyPattern = /^[A-Za-z][A-Za-z0-9_-]*(?:\.[A-Za-z0-9_-]+)*$/;

function readCheck(r: StageReader, i: number, seen: Set<string>, parts: Record<string, PartValue>): ManualCheck {
  onlyKeys(r, ['id', 'quantity', 'unit', 'nominal', 'tol', 'min', 'max', 'instrument', 'how']);
  const key = textAt(r, 'id', true, '"ref.dc"');
  if (!keyPattern.test(key))
    throw new StageParseError(r.file, `${r.path}.id`, `${JSON.stringify(key)} is not a check key; use letters, digits and dots, e.g. "ref.dc"`);
  if (seen.has(key)) throw new StageParseError(r.file, `${r.path}.id`, `${JSON.stringify(key)} is used twice in this stage; every check needs its own id`);
  seen.add(key);
  const quantity = textAt(r, 'quantity', true, '"reference voltage"');
  const unit = unitFrom(r);
  const instrument = r.json['instrument'] === undefined ? 'meter' : (textAt(r, 'instrument', true, '"meter"') as CheckSpec['instrument']);
  if (!['meter', 'scope', 'counter'].includes(instrument)) {
    throw new StageParseError(r.file, `${r.path}.instrument`, `${JSON.stringify(instrument)} is not one of "meter", "scope" or "counter"`);
  }
  const how = textAt(r, 'how', false, '"DC voltmeter from TP7 to ground"') ?? `${instrument === 'meter' ? 'meter' : instrument} reading as the plan describes`;
  const hasNominal = r.json['nominal'] !== undefined;
  const hasBand = r.json['min'] !== undefined || r.json['max'] !== undefined;
  const base = { key, quantity, unit, instrument, how };
  if (hasNominal && hasBand) throw new StageParseError(r.file, r.path, 'give either "nominal" and "tol", or "min" and "max", not both');
  if (!hasNominal && !hasBand)
    throw new StageParseError(r.file, r.path, 'no target; write "nominal" and "tol" (e.g. "2.5 V", "2%") or "min" and "max" (e.g. "-5 mV", "5 mV")');
  const example = unit === '1' ? '0.05' : `"1 ${unit === 'Ω' ? 'ohm' : unit}"`;
  if (hasNominal) {
    const nominal = partAt(r, 'nominal', unit, true, { example });
    const tolRaw = r.json['tol'];
    if (typeof tolRaw !== 'string')
      throw new StageParseError(
        r.file,
        `${r.path}.tol`,
        `${tolRaw === undefined ? 'missing' : 'must be text'}; write a percentage ("2%") or an amount in ${unit === '1' ? 'the same unit' : unit} (e.g. ${example})`,
      );
    const pct = /^\s*±?\s*(\d+(?:\.\d+)?)\s*%\s*$/.exec(tolRaw);
    if (pct && unit !== '1') {
      const role = `checks[${i}].nominal`;
      parts[role] = { ...nominal, tol: Number(pct[1]) / 100, text: `${nominal.text} ${tolRaw.trim()}` };
      if (nominal.nominal === 0)
        throw new StageParseError(r.file, `${r.path}.tol`, `a percentage of a zero nominal is zero; write an amount (e.g. ${example}) or "min" and "max"`);
      return { ...base, role };
    }
    const amount = parseValue(tolRaw, { expected: unit, allowTolerance: false });
    if (!amount.ok || !(amount.value > 0))
      throw new StageParseError(
        r.file,
        `${r.path}.tol`,
        `${JSON.stringify(tolRaw)} is not a tolerance; write a percentage ("2%") or an amount (e.g. ${example})`,
      );
    return bandCheck(base, i, nominal.nominal - amount.value, nominal.nominal + amount.value, parts);
  }
  const min = partAt(r, 'min', unit, true, { example });
  const max = partAt(r, 'max', unit, true, { example });
  if (!(max.nominal > min.nominal))
    throw new StageParseError(r.file, `${r.path}.max`, `${JSON.stringify(max.text)} must be above min ${JSON.stringify(min.text)}`);
  return bandCheck(base, i, min.nominal, max.nominal, parts);
}

function bandCheck(base: Omit<ManualCheck, 'role' | 'band'>, i: number, min: number, max: number, parts: Record<string, PartValue>): ManualCheck {
  const role = `checks[${i}].band`;
  parts[role] = { nominal: 1, tol: 0.5, unit: '1', text: `${min} … ${max} ${base.unit}` };
  return { ...base, role, band: { min, max } };
}

function evaluate(input: EvalInput<ManualSettings>): EvalOutput {
  const values: Record<string, number> = {};
  for (const c of input.settings.checks) {
    const p = input.parts[c.role] ?? Number.NaN;
    values[c.key] = c.band ? c.band.min + (c.band.max - c.band.min) * (p - 0.5) : p;
  }
  return { outputs: {}, values, warnings: [] };
}

export const manualKind: StageKind<ManualSettings> = {
  kind: 'manual',
  summary: 'targets written by hand (nominal ± tolerance, or min … max) for anything without a model',
  traits: { usesOpamp: false, isAmplifier: false, isHandWritten: true },
  roles: [
    { role: 'checks[i].nominal', unit: '1', description: "a hand-written nominal with its percentage tolerance (in the check's unit)" },
    { role: 'checks[i].band', unit: '1', description: 'position within a hand-written min … max band (0.5 = min, 1.5 = max)' },
  ],
  outputs: [],
  needsInput: false,
  parse(raw, file) {
    const r = reader(raw, file);
    const parts: Record<string, PartValue> = {};
    const seen = new Set<string>();
    const entries = list(r, 'checks', true, '{ "id": "ref.dc", "quantity": "reference voltage", "unit": "V", "nominal": "2.5 V", "tol": "2%" }');
    if (entries.length === 0) throw new StageParseError(file, `${raw.path}.checks`, 'is empty; write at least one check');
    const checks = entries.map((e, i) => readCheck(e, i, seen, parts));
    return { parts, settings: { checks } };
  },
  checks: (settings) =>
    settings.checks.map((c) => {
      const figure = captureFigureOf(c);
      return { key: c.key, quantity: c.quantity, unit: c.unit, instrument: c.instrument, how: c.how, ...(figure ? { captureFigure: figure } : {}) };
    }),
  evaluate,
  faultHints: {},
};
