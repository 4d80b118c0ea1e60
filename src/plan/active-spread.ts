import type { OpampModel } from '../circuit/types.js';
import { maxValueLength, parseValue } from '../units/parse.js';
import { type Unit, unitExample, unitNoun } from '../units/unit.js';
import { PlanError } from './errors.js';
import type { RawOpamp } from './schema.js';
import { checkTolerance } from './values.js';

/** The op-amp keys that may carry a spread, and so become chain variables (`opamp.gbw`). */
export const opampSpreadKeys = ['gbw', 'slew', 'headroom', 'vos', 'ib'] as const;
export type OpampSpreadKey = (typeof opampSpreadKeys)[number];

/** One op-amp key's spread: half-width around the model's value, in the key's unit. */
export interface Spread {
  readonly half: number;
  /** As the plan wrote it (or the default, said so), for messages. */
  readonly text: string;
}

export type OpampSpreads = Readonly<Partial<Record<OpampSpreadKey, Spread>>>;

/** A plan's (or a stage's) op-amp: the model at its nominal values and the spread of each toleranced key. */
export interface OpampSpec {
  readonly model: OpampModel;
  readonly spread: OpampSpreads;
}

/**
 * Input offset of a general-purpose op-amp when the plan gives none: ±5 mV
 * (data-sheet maximum at 25 °C of common bipolar general-purpose parts lies
 * around 3–7.5 mV; from memory, common practice, no source). It enters only
 * DC levels (`<stage>.<output>.dc`), so it widens no AC band.
 */
export const defaultVos: Spread = { half: 5e-3, text: "5 mV (default: a general-purpose op-amp's offset)" };

const units: Readonly<Record<OpampSpreadKey | 'maxSupply' | 'aol', Unit>> = {
  gbw: 'Hz',
  slew: 'V/s',
  headroom: 'V',
  vos: 'V',
  ib: 'A',
  maxSupply: 'V',
  aol: 'V/V',
};

/**
 * A value with a relative (`"1 MHz 30%"`) or absolute (`"1.5 V 0.3 V"`,
 * `"1.5 V ±0.3 V"`) tolerance, as half-width in the value's unit.
 */
export function readSpreadValue(raw: string | number, unit: Unit, file: string, path: string): { value: number; half: number } {
  if (typeof raw === 'number') {
    if (!Number.isFinite(raw) || (unit !== '1' && unit !== 'V/V'))
      throw new PlanError(file, path, `${raw}: write ${unitNoun[unit]} as text, e.g. ${unitExample[unit]}`);
    return { value: raw, half: 0 };
  }
  const whole = parseValue(raw, { expected: unit, allowTolerance: true });
  // Too long for any value: refused before the split below, which is quadratic in the words.
  if (raw.length > maxValueLength) throw new PlanError(file, path, whole.ok ? `${raw.length} characters is too long for a value` : whole.message);
  if (whole.ok) {
    const tol = whole.tol ?? 0;
    checkTolerance(tol, raw, file, path);
    return { value: whole.value, half: Math.abs(whole.value) * tol };
  }
  // An absolute tolerance: the value, then a second value of the same unit ("1.5 V 0.3 V", "1.5 V ±0.3 V").
  const tokens = raw.trim().split(/\s+/);
  for (let k = 1; k < tokens.length; k++) {
    const a = parseValue(tokens.slice(0, k).join(' '), { expected: unit, allowTolerance: false });
    const b = parseValue(
      tokens
        .slice(k)
        .join(' ')
        .replace(/^(±|\+\/-)\s*/, ''),
      { expected: unit, allowTolerance: false },
    );
    if (!a.ok || !b.ok || a.unit !== unit || b.unit !== unit) continue;
    if (!(b.value >= 0)) throw new PlanError(file, path, `${JSON.stringify(raw)}: a tolerance cannot be negative`);
    if (a.value !== 0 && b.value >= Math.abs(a.value)) {
      throw new PlanError(
        file,
        path,
        `${JSON.stringify(raw)}: the tolerance is as large as the value itself; write the part's real spread, e.g. "1.5 V 0.3 V"`,
      );
    }
    return { value: a.value, half: b.value };
  }
  throw new PlanError(
    file,
    path,
    `${whole.message}; a spread is written as a percentage or in the same unit, e.g. ${unitExample[unit].replace(/"$/, ' 20%"')}`,
  );
}

/**
 * An op-amp: `base` (the plan's, or the defaults) with the plan's (or the
 * stage's) keys on top. `gbw`, `slew`, `headroom` and `ib` take a relative or
 * absolute tolerance; `vos` is written as its ± maximum (`"2 mV"`: anywhere in
 * −2 … +2 mV, nominal 0). Keys the entry does not write keep the base's spread.
 */
export function readOpampSpec(raw: RawOpamp | undefined, base: OpampSpec, file: string, path: string): OpampSpec {
  if (!raw) return base;
  const model: Record<string, number> = { ...base.model };
  const spread: Partial<Record<OpampSpreadKey, Spread>> = { ...base.spread };
  for (const key of ['gbw', 'slew', 'headroom', 'maxSupply', 'aol', 'vos', 'ib'] as const) {
    const v = raw[key];
    if (v === undefined) continue;
    const where = `${path}.${key}`;
    const unit = units[key];
    if (key === 'vos') {
      const r = readSpreadValue(v, unit, file, where);
      if (r.half !== 0 || r.value < 0) {
        throw new PlanError(
          file,
          where,
          `${JSON.stringify(v)}: write the offset as its ± maximum from the data sheet, e.g. "2 mV" (the offset then lies anywhere in −2 … +2 mV)`,
        );
      }
      model['vos'] = 0;
      if (r.value > 0) spread.vos = { half: r.value, text: String(v) };
      else delete spread.vos;
      continue;
    }
    const r = readSpreadValue(v, unit, file, where);
    const positive = key !== 'headroom' && key !== 'ib';
    if (positive ? !(r.value > 0) : r.value < 0) throw new PlanError(file, where, `${JSON.stringify(v)} must be ${positive ? 'above zero' : 'zero or more'}`);
    if ((key === 'maxSupply' || key === 'aol') && r.half > 0) {
      throw new PlanError(file, where, `${JSON.stringify(v)}: ${key} is a limit, not a spread part; write it without a tolerance`);
    }
    model[key] = r.value;
    if (key !== 'maxSupply' && key !== 'aol') {
      if (r.half > 0) spread[key] = { half: r.half, text: String(v) };
      else delete spread[key];
    }
  }
  return { model: model as unknown as OpampModel, spread };
}

/** The board temperature range a plan gives, kelvin. */
export interface TemperatureRange {
  readonly min: number;
  readonly max: number;
  /** The midpoint of the range: the nominal of the `temperature` variable. */
  readonly nominal: number;
  readonly text: string;
}

/** `"15 °C"`, `"15 C"`, `"-10 °C"`, `"300 K"` → kelvin. */
function readTemperature(raw: unknown, file: string, path: string): number {
  const text = typeof raw === 'string' && raw.length <= maxValueLength ? raw : '';
  const m = /^\s*([-−+]?\d+(?:[.,]\d+)?)\s*(°\s*C|℃|C|K)\s*$/i.exec(text);
  if (!m) throw new PlanError(file, path, `${JSON.stringify(raw)} is not a temperature; write e.g. "15 °C"`);
  const value = Number((m[1] ?? '').replace('−', '-').replace(',', '.'));
  const kelvin = /^k$/i.test(m[2] ?? '') ? value : value + 273.15;
  // Below −55 °C or above 125 °C lies outside every common part's rating (common practice, no source).
  if (!(kelvin > 0)) throw new PlanError(file, path, `${JSON.stringify(raw)} is below absolute zero`);
  if (kelvin < 273.15 - 55 || kelvin > 273.15 + 125) {
    throw new PlanError(
      file,
      path,
      `${JSON.stringify(raw)} lies outside −55 … 125 °C, beyond the ratings of common parts; give the board's real ambient range`,
    );
  }
  return kelvin;
}

/**
 * The plan's `temperature` (`{"min": "15 °C", "max": "40 °C"}`): a worst-case
 * dimension of every junction law. Its nominal is the middle of the range, so
 * the box is symmetric about the nominal like every other variable's.
 */
export function readTemperatureRange(raw: { readonly min: string; readonly max: string } | undefined, file: string): TemperatureRange | undefined {
  if (!raw) return undefined;
  const min = readTemperature(raw.min, file, 'temperature.min');
  const max = readTemperature(raw.max, file, 'temperature.max');
  if (!(max >= min)) throw new PlanError(file, 'temperature', `max (${raw.max}) lies below min (${raw.min}); write {"min": "15 °C", "max": "40 °C"}`);
  return { min, max, nominal: (min + max) / 2, text: `${raw.min} … ${raw.max}` };
}
