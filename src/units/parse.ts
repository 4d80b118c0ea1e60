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
  /**
   * The bench writes decimal commas, so `"1,500"` is 1.5. Without it a comma
   * before exactly three digits is refused as ambiguous (1.5 or 1500?). @default false
   */
  readonly decimalComma?: boolean;
}

/** The longest value text read; anything longer is refused before any pattern runs. */
export const maxValueLength = 200;

const rkmPattern = /^([+-]?\d+)([RrkKmMuµμnpfGT])(\d+)(Ω|[oO]hms?|F|H|V|v|A|Hz|hz)?$/;
const numberPattern = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/;
const slewPattern = /^([a-zA-Zµμ]*)[vV]\/([a-zA-Zµμ]*)s$/;

function fail(message: string): ParseFailure {
  return { ok: false, message };
}

/** The typed text as messages quote it: JSON-quoted, cut to 40 characters so an error stays one short line. */
export function quoteTyped(text: string): string {
  return text.length <= 40 ? JSON.stringify(text) : `${JSON.stringify(text.slice(0, 40)).slice(0, -1)}…" (${text.length} characters)`;
}

const isSpace = (c: string | undefined): boolean => c !== undefined && /\s/.test(c);

/**
 * A trailing tolerance (`"4k7 1%"`, `"10k ±20%"`, `"5%"`): where it starts (the
 * space before it, or 0 at the start) and its percentage. One backward scan, so
 * long runs of spaces cost linear time (the regular expression it replaces,
 * `(?:^|\s)±?\s*(\d+(?:\.\d+)?)\s*%$`, backtracked quadratically on them).
 */
function findTolerance(body: string): { index: number; percent: string } | undefined {
  let j = body.length - 1;
  if (body[j] !== '%') return undefined;
  j--;
  while (isSpace(body[j])) j--;
  const end = j + 1;
  while (j >= 0 && /[\d.]/.test(body[j] ?? '')) j--;
  const percent = body.slice(j + 1, end);
  if (!/^\d+(?:\.\d+)?$/.test(percent)) return undefined;
  let k = j;
  while (isSpace(body[k])) k--;
  const isSpacedFromDigits = k < j;
  if (body[k] === '±') {
    let m = k - 1;
    while (isSpace(body[m])) m--;
    if (m < 0) return { index: 0, percent };
    if (m < k - 1) return { index: m + 1, percent };
    // A sign glued to the value ("10k± 20%"): the tolerance can only start after it.
    return isSpacedFromDigits ? { index: k + 1, percent } : undefined;
  }
  if (k < 0) return { index: 0, percent };
  // Glued to the value ("4k75%") it is not a tolerance.
  return isSpacedFromDigits ? { index: k + 1, percent } : undefined;
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
 * The value with the space between number and unit taken out (`"12 V"` →
 * `"12V"`, `"10 k ohm"` → `"10kohm"`), or undefined when a space would join
 * digits (`"1 2"`, `"12 05"`, `"4 k 7"`, `"4 k7"`): the part before the first
 * space must be a whole number (or RKM code) and the part after it hold no digit.
 */
function joinUnit(body: string): string | undefined {
  const gap = /\s+/.exec(body);
  if (!gap) return body;
  const head = body.slice(0, gap.index);
  const tail = body.slice(gap.index + gap[0].length);
  if (/\d/.test(tail)) return undefined;
  const num = numberPattern.exec(head);
  const isNumber = num !== null && num[0].length === head.length;
  if (!isNumber && !rkmPattern.test(head)) return undefined;
  return head + tail.replace(/\s+/g, '');
}

/**
 * Parse a value as a technician or a plan writes it: SI prefixes (`4.98k`,
 * `10 nF`, `1 MHz`), RKM codes (IEC 60062: `4k7`, `2R2`, `1M5`, `10n`), a unit
 * or none (then the expected one), a decimal comma (`4,98`), and in plans a
 * trailing tolerance (`"22n 5%"`). A fraction may be written as a percentage
 * (`"2.5%"`) where a plain number is expected.
 */
export function parseValue(text: string, options: ParseOptions = {}): ParseResult {
  const { expected, allowTolerance = true, decimalComma = false } = options;
  const shown = quoteTyped(text);
  const hint = expected ? `; write ${unitNoun[expected]}, e.g. ${unitExample[expected]}` : '';
  if (text.length > maxValueLength) return fail(`${shown} is too long for a value (at most ${maxValueLength} characters)${hint}`);
  // Control characters (escape sequences, NUL, bell) are never part of a value; tabs and line ends are spaces, judged below.
  if (/[\u0000-\u0008\u000e-\u001f\u007f-\u009f]/.test(text)) return fail(`${shown} holds control characters; type the value alone${hint}`);
  let body = text.trim().replace(/\u2212/g, '-');
  if (body === '') return fail(expected ? `no value given; write ${unitNoun[expected]}, e.g. ${unitExample[expected]}` : 'no value given');

  // A fraction written as a percentage where a plain number is expected ("2.5%", "-0.4 %", "1e-3 %").
  const percent = expected === '1' ? /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)[ \t]*%$/.exec(body) : null;
  if (percent) {
    const fraction = Number((Number(percent[1]) / 100).toPrecision(12));
    if (fraction !== 0 && !(Math.abs(fraction) >= 1e-24 && Math.abs(fraction) <= 1e24)) return fail(`${shown} is out of range for a value (1e-24 … 1e24)`);
    return { ok: true, value: fraction, unit: '1' };
  }

  let tol: number | undefined;
  const tolMatch = findTolerance(body);
  if (tolMatch && tolMatch.index > 0) {
    if (!allowTolerance) {
      return fail(`${shown} carries a tolerance; a reading is a single value, e.g. ${expected ? unitExample[expected].replace(/ \d+%/, '') : '"4.98k"'}`);
    }
    tol = Number(tolMatch.percent) / 100;
    body = body.slice(0, tolMatch.index).trim();
  }

  // A decimal comma: exactly one comma and no point.
  if (/^[^.]*,[^,]*$/.test(body) && /\d,\d/.test(body)) {
    const group = /^(.*\d),(\d{3})(?!\d)(.*)$/s.exec(body);
    if (group && !decimalComma) {
      // "1,500": a thousands group or a decimal comma? Saving either could be a wrong value.
      const [, head = '', digits = '', tail = ''] = group;
      const fraction = digits.replace(/0+$/, '') || '0';
      return fail(`${shown} is ambiguous (a decimal comma or a thousands separator?): write ${head}.${fraction}${tail} or ${head}${digits}${tail}`);
    }
    body = body.replace(',', '.');
  }
  const compact = joinUnit(body);
  if (compact === undefined) {
    // Offer the two readings the typist may have meant: the digits joined, or the space as a decimal point.
    // Only readings that parse are offered ("4 MHz 3O%" joined is no value either).
    const joined = body.replace(/\s+/g, '');
    const dotted = body.replace(/(\d)\s+(\d)/, '$1.$2').replace(/\s+/g, '');
    const parses = (candidate: string): boolean => parseValue(candidate, options).ok;
    const readings = [...new Set([joined, ...(body.includes('.') ? [] : [dotted])])].filter(parses);
    if (readings.length === 0) return fail(`${shown} is not a value${hint || ' (a number, an SI prefix and a unit, e.g. "4.7k" or "10 nF")'}`);
    const offer = `write ${readings.join(' or ')}`;
    return fail(
      `${shown} has a space inside the number: ${offer.length > 60 ? 'write the number without spaces' : offer} (a space may only stand before the unit${expected ? `, as in ${unitExample[expected]}` : ''})`,
    );
  }

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
    if (!num) return fail(`${shown} is not a number${hint}`);
    const suffix = readSuffix(compact.slice(num[0].length));
    if (!suffix) return fail(`${shown}: ${quoteTyped(compact.slice(num[0].length))} is not a unit or prefix${hint}`);
    value = Number(num[0]) * suffix.scale;
    unit = suffix.unit;
  }

  if (!Number.isFinite(value)) return fail(`${shown} is not a finite number`);
  // Beyond the SI prefixes (yocto … yotta, BIPM SI Brochure 9th ed. 2019, Table 7) no bench value lies: a typo, not a reading.
  if (value !== 0 && (Math.abs(value) < 1e-24 || Math.abs(value) > 1e24)) return fail(`${shown} is out of range for a value (1e-24 … 1e24 in SI units)${hint}`);
  if (expected && unit && unit !== expected) {
    return fail(`${shown} is ${unitNoun[unit]}; expected ${unitNoun[expected]}, e.g. ${unitExample[expected]}`);
  }
  const finalUnit = unit ?? expected;
  if (!finalUnit) return fail(`${shown} has no unit; write one, e.g. "12 V" or "4k7"`);
  // Tiny floating residue from prefix scaling (4.7 * 1e3 = 4700.000000000001) is rounded away.
  const clean = Number(value.toPrecision(12));
  return tol === undefined ? { ok: true, value: clean, unit: finalUnit } : { ok: true, value: clean, unit: finalUnit, tol };
}
