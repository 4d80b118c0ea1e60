import { prefixes } from './prefix.js';
import { type Unit, unitAliases, unitExample, unitNoun } from './unit.js';

/** A value read from text: SI base units, the unit it carries and, if written, its tolerance. */
export interface ParsedValue {
  readonly ok: true;
  /** The value in SI base units. */
  readonly value: number;
  readonly unit: Unit;
  /** Symmetric tolerance as a fraction (`"5%"` → 0.05), when one was written. */
  readonly tol?: number;
}

/** Why a text is not a value of the expected kind, in words a technician can act on. */
export interface ParseFailure {
  readonly ok: false;
  readonly message: string;
}

export type ParseResult = ParsedValue | ParseFailure;

export interface ParseOptions {
  /** The unit the value must have; a bare number takes it. */
  readonly expected?: Unit;
  /** Accept a trailing tolerance (`"22n 5%"`), as in a plan; readings have none. @default true */
  readonly allowTolerance?: boolean;
}

const rkmPattern = /^([+-]?\d+)([RrkKmMuµμnpfGT])(\d+)(Ω|[oO]hms?|F|H|V|v|A|Hz|hz)?$/;
const numberPattern = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/;
const tolerancePattern = /(?:^|\s)±?\s*(\d+(?:\.\d+)?)\s*%$/;
const slewPattern = /^([a-zA-Zµμ]*)[vV]\/([a-zA-Zµμ]*)s$/;

function fail(message: string): ParseFailure {
  return { ok: false, message };
}

/** Read a prefix-and-unit suffix such as `kHz`, `nF`, `mA`, `V`, `k`, `R`, `V/us`. */
function readSuffix(suffix: string): { scale: number; unit: Unit | undefined } | undefined {
  if (suffix === '') return { scale: 1, unit: undefined };
  const slew = slewPattern.exec(suffix);
  if (slew) {
    const top = slew[1] === '' ? 1 : prefixes[slew[1] ?? ''];
    const bottom = slew[2] === '' ? 1 : prefixes[slew[2] ?? ''];
    if (top === undefined || bottom === undefined) return undefined;
    return { scale: top / bottom, unit: 'V/s' };
  }
  const direct = unitOf(suffix);
  if (direct) return { scale: 1, unit: direct };
  // A prefix alone: `k`, `u`, `meg`, and `R`, the RKM mark for ohms.
  if (suffix === 'R' || suffix === 'r') return { scale: 1, unit: 'Ω' };
  const alone = prefixes[suffix];
  if (alone !== undefined) return { scale: alone, unit: undefined };
  for (const length of [3, 1]) {
    const head = suffix.slice(0, length);
    const scale = prefixes[head];
    const rest = unitOf(suffix.slice(length));
    if (scale !== undefined && rest) return { scale, unit: rest };
  }
  return undefined;
}

/**
 * The unit named by a symbol. Single letters keep their case where case decides
 * (`F` farad but `f` femto); longer names are case-blind (`hz`, `Ohm`).
 */
function unitOf(symbol: string): Unit | undefined {
  if (symbol === '') return undefined;
  if (symbol.length === 1) {
    if (symbol === 'f' || symbol === 'm' || symbol === 'M' || symbol === 'k' || symbol === 'n' || symbol === 'p' || symbol === 'u') {
      return undefined;
    }
    if (symbol === 'h') return undefined;
  }
  return unitAliases[symbol] ?? unitAliases[symbol.toLowerCase()];
}

/**
 * Parse a value as a technician or a plan writes it: SI prefixes (`4.98k`,
 * `10 nF`, `1 MHz`), RKM codes (IEC 60062: `4k7`, `2R2`, `1M5`, `10n`), a unit
 * or none (then the expected one), a decimal comma (`4,98`), and in plans a
 * trailing tolerance (`"22n 5%"`). A fraction may be written as a percentage
 * (`"2.5%"`) where a plain number is expected.
 */
export function parseValue(text: string, options: ParseOptions = {}): ParseResult {
  const { expected, allowTolerance = true } = options;
  const shown = JSON.stringify(text);
  let body = text.trim().replace(/\u2212/g, '-');
  if (body === '') return fail(expected ? `no value given; write ${unitNoun[expected]}, e.g. ${unitExample[expected]}` : 'no value given');

  let tol: number | undefined;
  const tolMatch = tolerancePattern.exec(body);
  if (tolMatch && tolMatch.index > 0) {
    if (!allowTolerance) {
      if (expected === '1') {
        // "2.5%" as a reading of a fraction.
        const pct = Number(body.slice(0, body.length - 1).trim());
        if (Number.isFinite(pct)) return { ok: true, value: pct / 100, unit: '1' };
      }
      return fail(`${shown} carries a tolerance; a reading is a single value, e.g. ${expected ? unitExample[expected].replace(/ \d+%/, '') : '"4.98k"'}`);
    }
    tol = Number(tolMatch[1]) / 100;
    body = body.slice(0, tolMatch.index).trim();
  } else if (tolMatch && tolMatch.index === 0 && expected === '1') {
    return { ok: true, value: Number(tolMatch[1]) / 100, unit: '1' };
  }

  // A decimal comma: exactly one comma and no point.
  if (/^[^.]*,[^,]*$/.test(body) && /\d,\d/.test(body)) body = body.replace(',', '.');
  const compact = body.replace(/\s+/g, '');

  let value: number;
  let unit: Unit | undefined;
  const rkm = rkmPattern.exec(compact);
  if (rkm) {
    const mark = rkm[2] ?? '';
    const isOhmMark = mark === 'R' || mark === 'r';
    const scale = isOhmMark ? 1 : (prefixes[mark] ?? Number.NaN);
    value = Number(`${rkm[1]}.${rkm[3]}`) * scale;
    unit = rkm[4] ? unitOf(rkm[4]) : isOhmMark ? 'Ω' : undefined;
  } else {
    const num = numberPattern.exec(compact);
    if (!num) return fail(`${shown} is not a number${expected ? `; write ${unitNoun[expected]}, e.g. ${unitExample[expected]}` : ''}`);
    const suffix = readSuffix(compact.slice(num[0].length));
    if (!suffix) {
      return fail(`${shown}: "${compact.slice(num[0].length)}" is not a unit or prefix${expected ? `; write ${unitNoun[expected]}, e.g. ${unitExample[expected]}` : ''}`);
    }
    value = Number(num[0]) * suffix.scale;
    unit = suffix.unit;
  }

  if (!Number.isFinite(value)) return fail(`${shown} is not a finite number`);
  if (expected && unit && unit !== expected) {
    return fail(`${shown} is ${unitNoun[unit]}; expected ${unitNoun[expected]}, e.g. ${unitExample[expected]}`);
  }
  const finalUnit = unit ?? expected;
  if (!finalUnit) return fail(`${shown} has no unit; write one, e.g. "12 V" or "4k7"`);
  // Tiny floating residue from prefix scaling (4.7 * 1e3 = 4700.000000000001) is rounded away.
  const clean = Number(value.toPrecision(12));
  return tol === undefined ? { ok: true, value: clean, unit: finalUnit } : { ok: true, value: clean, unit: finalUnit, tol };
}
