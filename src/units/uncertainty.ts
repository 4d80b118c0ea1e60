import { maxValueLength, parseValue } from './parse.js';
import type { Unit } from './unit.js';

/** An instrument's uncertainty as `relative · |reading| + absolute` (the way meter specs read). */
export interface UncertaintySpec {
  /** Fraction of the reading. */
  readonly relative: number;
  /** In the unit of the reading. */
  readonly absolute: number;
}

/** The expanded uncertainty U of a reading under a spec. */
export function uncertaintyOf(reading: number, spec: UncertaintySpec): number {
  return spec.relative * Math.abs(reading) + spec.absolute;
}

/**
 * Parse a spec such as `"0.5% + 2 mV"`, `"1% + 0.1 mA"`, `"0.01%"` or `"2 mV"`.
 * Returns a message instead when it cannot.
 */
export function parseUncertainty(text: string, unit: Unit): UncertaintySpec | string {
  let relative = 0;
  let absolute = 0;
  if (text.length > maxValueLength) return `an uncertainty of ${text.length} characters is too long; write e.g. "0.5% + 2 mV"`;
  const terms = text
    .split('+')
    .map((t) => t.trim())
    .filter((t) => t !== '');
  if (terms.length === 0) return `${JSON.stringify(text)} is empty; write e.g. "0.5% + 2 mV"`;
  for (const term of terms) {
    const pct = /^(\d+(?:\.\d+)?)\s*%$/.exec(term);
    if (pct) {
      relative += Number(pct[1]) / 100;
      continue;
    }
    const parsed = parseValue(term, { expected: unit, allowTolerance: false });
    if (!parsed.ok) return `${JSON.stringify(text)}: ${parsed.message}`;
    if (parsed.value < 0) return `${JSON.stringify(text)}: an uncertainty cannot be negative`;
    absolute += parsed.value;
  }
  return { relative, absolute };
}
