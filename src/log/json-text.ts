import { findJsonFault, lineColumn } from '../plan/json-position.js';

/**
 * JSON for log files. Readings may be ±Infinity (an open circuit read as "OL"),
 * which JSON cannot hold: such a `value` is written as the string "Infinity" or
 * "-Infinity" and read back as the number.
 */
export function toLogJson(data: unknown, indent?: number): string {
  return JSON.stringify(
    data,
    (key, v: unknown) => (key === 'value' && typeof v === 'number' && !Number.isFinite(v) ? (v > 0 ? 'Infinity' : '-Infinity') : v),
    indent,
  );
}

export type JsonParse = { ok: true; data: unknown } | { ok: false; problem: string };

/** Parse log JSON; on failure say where (line and column, 1-based) and what was expected there. */
export function fromLogJson(text: string): JsonParse {
  try {
    return {
      ok: true,
      data: JSON.parse(text, (key, v: unknown) => (key === 'value' && (v === 'Infinity' || v === '-Infinity') ? (v === 'Infinity' ? Infinity : -Infinity) : v)),
    };
  } catch {
    // JSON.parse does not always say where; the grammar walk does.
    const fault = findJsonFault(text);
    if (!fault) return { ok: false, problem: 'the JSON does not parse' };
    const end = lineColumn(text, text.trimEnd().length);
    const isCut = fault.line > end.line || (fault.line === end.line && fault.column >= end.column);
    const where = `at line ${fault.line}, column ${fault.column}`;
    return {
      ok: false,
      problem: isCut ? `the JSON ends early ${where} (the file looks cut short)` : `the JSON does not parse ${where} (expected ${fault.expected})`,
    };
  }
}
