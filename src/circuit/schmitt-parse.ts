import { StageParseError } from './errors.js';
import { parseValue } from '../units/parse.js';
import { type Unit, unitNoun } from '../units/unit.js';
import type { ParsedStage, PartValue, RawStage } from './types.js';

/** What a schmitt-integrator plan entry sets besides its toleranced parts. */
export interface SchmittSettings {
  /** Whether a pot RV sits in series with Rt. */
  readonly hasPot: boolean;
  /** Wiper setting 0–1 (0: RV shorted, 1: all of RV in); 0 without a pot. */
  readonly pot: number;
  /** Whether back-to-back zeners clamp the square node (`clamp.vz`, `clamp.vf` parts). */
  readonly hasClamp: boolean;
}

/** Spread of a zener's vz when the plan gives none (see where it is used). */
export const defaultZenerTol = 0.05;

const partUnits: Readonly<Record<string, { unit: Unit; example: string; required: boolean }>> = {
  R1: { unit: 'Ω', example: '"10k 1%"', required: true },
  R2: { unit: 'Ω', example: '"22k 1%"', required: true },
  Rt: { unit: 'Ω', example: '"3k3 1%"', required: true },
  Ct: { unit: 'F', example: '"22n 5%"', required: true },
  RV: { unit: 'Ω', example: '"10k 20%"', required: false },
  Rz: { unit: 'Ω', example: '"1k 5%"', required: false },
};

function objectAt(json: Readonly<Record<string, unknown>>, key: string, file: string, path: string, example: string) {
  const value = json[key];
  if (value === undefined) return undefined;
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new StageParseError(file, path, `must be an object, e.g. ${example}`);
  }
  return value as Readonly<Record<string, unknown>>;
}

/** A toleranced value that must be above zero, as text with its unit. */
function positiveValue(raw: unknown, unit: Unit, example: string, file: string, path: string): PartValue {
  if (typeof raw !== 'string') {
    throw new StageParseError(file, path, `${JSON.stringify(raw)} is not ${unitNoun[unit]}; write it as text, e.g. ${example}`);
  }
  const parsed = parseValue(raw, { expected: unit });
  if (!parsed.ok) {
    throw new StageParseError(file, path, `${JSON.stringify(raw)} is not ${unitNoun[unit]}; write e.g. ${example}`);
  }
  if (!(parsed.value > 0)) throw new StageParseError(file, path, `${JSON.stringify(raw)} must be above zero; write e.g. ${example}`);
  const tol = parsed.tol ?? 0;
  if (tol >= 1) throw new StageParseError(file, path, `${JSON.stringify(raw)}: a tolerance of 100 % or more is not a part; write e.g. ${example}`);
  return { nominal: parsed.value, tol, unit, text: raw };
}

/** Read the kind-specific keys: `parts`, `pot`, `clamp`. Other keys belong to the plan loader. */
export function parseSchmitt(raw: RawStage, file: string): ParsedStage<SchmittSettings> {
  const base = raw.path;
  const partsJson = objectAt(raw.json, 'parts', file, `${base}.parts`, '{ "R1": "10k 1%", "R2": "22k 1%", "Rt": "3k3 1%", "Ct": "22n 5%" }');
  if (!partsJson) {
    throw new StageParseError(
      file,
      `${base}.parts`,
      'missing; a schmitt-integrator needs R1, R2, Rt and Ct, e.g. { "R1": "10k 1%", "R2": "22k 1%", "Rt": "3k3 1%", "Ct": "22n 5%" }',
    );
  }
  const parts: Record<string, PartValue> = {};
  for (const key of Object.keys(partsJson)) {
    if (!(key in partUnits)) {
      throw new StageParseError(file, `${base}.parts.${key}`, `is not a part of a schmitt-integrator; its parts are ${Object.keys(partUnits).join(', ')}`);
    }
  }
  for (const [role, spec] of Object.entries(partUnits)) {
    const value = partsJson[role];
    const path = `${base}.parts.${role}`;
    if (value === undefined) {
      if (spec.required) throw new StageParseError(file, path, `missing; write the fitted ${role}, e.g. "${role}": ${spec.example}`);
      continue;
    }
    parts[role] = positiveValue(value, spec.unit, spec.example, file, path);
  }

  const hasPot = parts['RV'] !== undefined;
  let pot = hasPot ? 0.5 : 0;
  const potJson = objectAt(raw.json, 'pot', file, `${base}.pot`, '{ "RV": 0.5 }');
  if (potJson) {
    for (const key of Object.keys(potJson)) {
      if (key !== 'RV') throw new StageParseError(file, `${base}.pot.${key}`, 'is not a pot of a schmitt-integrator; the only pot is RV, e.g. { "RV": 0.5 }');
    }
    const setting = potJson['RV'];
    if (setting !== undefined) {
      const path = `${base}.pot.RV`;
      if (!hasPot) throw new StageParseError(file, path, `a setting is given but parts has no RV; add the pot, e.g. "RV": "10k 20%", or drop the setting`);
      const value = typeof setting === 'number' ? setting : typeof setting === 'string' ? Number(setting) : Number.NaN;
      if (!Number.isFinite(value) || value < 0 || value > 1) {
        throw new StageParseError(
          file,
          path,
          `${JSON.stringify(setting)} is not a wiper setting; write a number from 0 (RV shorted) to 1 (all of RV in), e.g. 0.5`,
        );
      }
      pot = value;
    }
  }

  const clampJson = objectAt(raw.json, 'clamp', file, `${base}.clamp`, '{ "vz": "3.9 V", "vf": "0.7 V" }');
  if (clampJson) {
    for (const key of Object.keys(clampJson)) {
      if (key !== 'vz' && key !== 'vf' && key !== 'vz2' && key !== 'vf2') {
        throw new StageParseError(
          file,
          `${base}.clamp.${key}`,
          'is not a clamp value; write the zener voltage vz and the forward drop vf, e.g. { "vz": "3.9 V", "vf": "0.7 V" }, and for a pair of two different zeners the second one\'s vz2 (and vf2)',
        );
      }
    }
    for (const [key, example] of [
      ['vz', '"3.9 V 5%"'],
      ['vf', '"0.7 V"'],
    ] as const) {
      const path = `${base}.clamp.${key}`;
      const value = clampJson[key];
      if (value === undefined) throw new StageParseError(file, path, `missing; the clamp needs vz and vf, e.g. "${key}": ${example}`);
      const part = positiveValue(value, 'V', example, file, path);
      // A zener written without a tolerance spreads as the common ±5 % selection of
      // small zener series does (the "C" grade; from memory of data sheets, common practice).
      parts[`clamp.${key}`] =
        key === 'vz' && part.tol === 0 ? { ...part, tol: defaultZenerTol, text: `${part.text} ${defaultZenerTol * 100}% (default zener spread)` } : part;
    }
    // Two zeners, each with its own spread: `clamp.vz`/`clamp.vf` are the one in
    // breakdown at the high level (D1), `clamp.vz2`/`clamp.vf2` its partner (D2).
    // High level = vz + vf2, low level = −(vz2 + vf): a mismatched pair moves the
    // duty away from 50 %, which is what a duty reading on a real board shows.
    // A plan may fit two different zeners (`vz2`, `vf2`: the second one's, sets the low level);
    // otherwise the partner is the same type, with its own spread.
    const vz = parts['clamp.vz'];
    const vf = parts['clamp.vf'];
    for (const [key, same, example] of [
      ['vz2', vz, '"4.3 V 5%"'],
      ['vf2', vf, '"0.7 V"'],
    ] as const) {
      const value = clampJson[key];
      const own = value === undefined ? undefined : positiveValue(value, 'V', example, file, `${base}.clamp.${key}`);
      const part = own ?? same;
      if (part) parts[`clamp.${key}`] = part;
    }
  }
  return { parts, settings: { hasPot, pot, hasClamp: clampJson !== undefined } };
}
