import { StageParseError } from './errors.js';
import { formatValue } from '../units/format.js';
import { parseValue } from '../units/parse.js';
import { type Unit, unitExample, unitNoun } from '../units/unit.js';
import type { PartValue, RawStage } from './types.js';

/**
 * Small readers shared by the stage kinds' `parse`: each names the JSON path of
 * what it reads, so every mistake in a plan becomes a StageParseError the technician
 * can act on (`stages[2].parts.Rf: "33x" is not a resistance; write e.g. "33k 1%"`).
 */
export interface StageReader {
  readonly file: string;
  readonly path: string;
  /** The stage object (or a nested object) being read. */
  readonly json: Readonly<Record<string, unknown>>;
}

export function reader(raw: RawStage, file: string): StageReader {
  return { file, path: raw.path, json: raw.json };
}

/** A reader for a nested object (`parts`, `branches[1]`); a missing object is empty. */
export function nested(r: StageReader, key: string, required = false): StageReader {
  const value = r.json[key];
  const path = `${r.path}.${key}`;
  if (value === undefined) {
    if (required) throw new StageParseError(r.file, path, `missing; this stage kind needs "${key}"`);
    return { file: r.file, path, json: {} };
  }
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new StageParseError(r.file, path, `must be an object, e.g. { "R": "10k 1%" }`);
  }
  return { file: r.file, path, json: value as Record<string, unknown> };
}

/** Readers for the entries of an array (`branches`, `checks`). */
export function list(r: StageReader, key: string, required: boolean, example: string): StageReader[] {
  const value = r.json[key];
  const path = `${r.path}.${key}`;
  if (value === undefined) {
    if (required) throw new StageParseError(r.file, path, `missing; write a list, e.g. [${example}]`);
    return [];
  }
  if (!Array.isArray(value)) throw new StageParseError(r.file, path, `must be a list, e.g. [${example}]`);
  return value.map((item, i) => {
    const itemPath = `${path}[${i}]`;
    if (typeof item !== 'object' || item === null || Array.isArray(item)) {
      throw new StageParseError(r.file, itemPath, `must be an object, e.g. ${example}`);
    }
    return { file: r.file, path: itemPath, json: item as Record<string, unknown> };
  });
}

export interface ValueRule {
  /** Refuse zero and negative values (resistances, capacitances, frequencies). */
  readonly positive?: boolean;
  /** Refuse negative values. */
  readonly nonNegative?: boolean;
  /** Example for the message; defaults to the unit's example. */
  readonly example?: string;
  /** Values outside this range are a slip (`"10k"` for a capacitor is 10 kF), not a part. */
  readonly plausible?: readonly [number, number];
}

/** Resistors from 1 mΩ to 10 GΩ; outside is a prefix slip (`"10n"`), not a part. */
export const ohmRange: readonly [number, number] = [1e-3, 1e10];

/**
 * A toleranced value (`"33k 1%"`, `"2.5 V"`), or a plain JSON number for a
 * dimensionless one. Returns undefined when absent and not required.
 */
export function partAt(r: StageReader, key: string, unit: Unit, required: true, rule?: ValueRule): PartValue;
export function partAt(r: StageReader, key: string, unit: Unit, required: boolean, rule?: ValueRule): PartValue | undefined;
export function partAt(r: StageReader, key: string, unit: Unit, required: boolean, rule: ValueRule = {}): PartValue | undefined {
  const path = `${r.path}.${key}`;
  const raw = r.json[key];
  const example = rule.example ?? unitExample[unit];
  if (raw === undefined || raw === null) {
    if (required) throw new StageParseError(r.file, path, `missing; write ${unitNoun[unit]}, e.g. ${example}`);
    return undefined;
  }
  let part: PartValue;
  if (typeof raw === 'number') {
    // Plain numbers only where no unit can be mistaken (emission coefficient, hfe, pot setting).
    if (unit !== '1' && unit !== 'V/V') {
      throw new StageParseError(r.file, path, `${raw} has no unit; write it as text, e.g. ${example}`);
    }
    if (!Number.isFinite(raw)) throw new StageParseError(r.file, path, `${raw} is not a finite number; write e.g. ${example}`);
    part = { nominal: raw, tol: 0, unit, text: String(raw) };
  } else if (typeof raw === 'string') {
    const parsed = parseValue(raw, { expected: unit });
    if (!parsed.ok) throw new StageParseError(r.file, path, `${parsed.message.replace(/(; write |, e\.g\. ).*$/, '')}; write e.g. ${example}`);
    if (parsed.tol !== undefined && parsed.tol >= 1) {
      throw new StageParseError(r.file, path, `${JSON.stringify(raw)}: a tolerance of 100 % or more is not a part; write e.g. ${example}`);
    }
    part = { nominal: parsed.value, tol: parsed.tol ?? 0, unit, text: raw };
  } else {
    throw new StageParseError(r.file, path, `must be text such as ${example}`);
  }
  if (rule.positive && !(part.nominal > 0)) {
    throw new StageParseError(r.file, path, `${JSON.stringify(part.text)} must be above zero; write e.g. ${example}`);
  }
  if (rule.plausible && (part.nominal < rule.plausible[0] || part.nominal > rule.plausible[1])) {
    throw new StageParseError(
      r.file,
      path,
      `${JSON.stringify(part.text)} reads as ${formatValue(part.nominal, unit)}, not a plausible value here; write e.g. ${example}`,
    );
  }
  if (rule.nonNegative && part.nominal < 0) {
    throw new StageParseError(r.file, path, `${JSON.stringify(part.text)} must not be negative; write e.g. ${example}`);
  }
  return part;
}

/** A whole number within limits (`diodes`). */
export function countAt(r: StageReader, key: string, fallback: number, min: number, max: number): number {
  const path = `${r.path}.${key}`;
  const raw = r.json[key];
  if (raw === undefined) return fallback;
  if (typeof raw !== 'number' || !Number.isInteger(raw) || raw < min || raw > max) {
    throw new StageParseError(r.file, path, `${JSON.stringify(raw)} must be a whole number from ${min} to ${max}, e.g. ${fallback}`);
  }
  return raw;
}

/** One of a few words (`"+"`/`"-"`, `"none"`/`"diodes"`). */
export function choiceAt<T extends string>(r: StageReader, key: string, choices: readonly T[], fallback?: T): T {
  const path = `${r.path}.${key}`;
  const raw = r.json[key];
  if (raw === undefined && fallback !== undefined) return fallback;
  const shown = choices.map((c) => JSON.stringify(c)).join(' or ');
  if (raw === undefined) throw new StageParseError(r.file, path, `missing; write ${shown}`);
  if (typeof raw !== 'string' || !(choices as readonly string[]).includes(raw)) {
    throw new StageParseError(r.file, path, `${JSON.stringify(raw)} is not one of ${shown}`);
  }
  return raw as T;
}

/** Text (`from`, `quantity`). */
export function textAt(r: StageReader, key: string, required: true, example: string): string;
export function textAt(r: StageReader, key: string, required: boolean, example: string): string | undefined;
export function textAt(r: StageReader, key: string, required: boolean, example: string): string | undefined {
  const path = `${r.path}.${key}`;
  const raw = r.json[key];
  if (raw === undefined) {
    if (required) throw new StageParseError(r.file, path, `missing; write e.g. ${example}`);
    return undefined;
  }
  if (typeof raw !== 'string' || raw.trim() === '') throw new StageParseError(r.file, path, `must be text, e.g. ${example}`);
  return raw.trim();
}

/** Refuse keys a kind does not know (a typo such as `"Rff"` must not be ignored silently). */
export function onlyKeys(r: StageReader, known: readonly string[]): void {
  for (const key of Object.keys(r.json)) {
    if (!known.includes(key)) {
      throw new StageParseError(r.file, `${r.path}.${key}`, `is not a key here; known keys are ${known.join(', ')}`);
    }
  }
}
