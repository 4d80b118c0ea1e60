/**
 * JSON for log files. Readings may be ±Infinity (an open circuit read as "OL"),
 * which JSON cannot hold: such a `value` is written as the string "Infinity" or
 * "-Infinity" and read back as the number.
 */
export function toLogJson(data: unknown, indent?: number): string {
  return JSON.stringify(data, (key, v: unknown) => (key === 'value' && typeof v === 'number' && !Number.isFinite(v) ? (v > 0 ? 'Infinity' : '-Infinity') : v), indent);
}

export type JsonParse = { ok: true; data: unknown } | { ok: false; problem: string };

/** Parse log JSON; on failure say where, as line and column (1-based) and byte-ish position. */
export function fromLogJson(text: string): JsonParse {
  try {
    return { ok: true, data: JSON.parse(text, (key, v: unknown) => (key === 'value' && (v === 'Infinity' || v === '-Infinity') ? (v === 'Infinity' ? Infinity : -Infinity) : v)) };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const at = /position (\d+)/.exec(message);
    const position = at ? Number(at[1]) : /end of JSON input/i.test(message) ? text.length : null;
    const cutShort = /end of JSON input/i.test(message) || (position !== null && position >= text.trimEnd().length);
    const detail = message.replace(/\s*in JSON at position \d+.*$/s, '').replace(/\s*\(line \d+ column \d+\)$/, '');
    const reason = cutShort ? 'the JSON ends early (the file looks cut short)' : `the JSON does not parse (${detail})`;
    if (position === null) return { ok: false, problem: reason };
    const before = text.slice(0, position);
    const line = before.split('\n').length;
    const column = position - before.lastIndexOf('\n');
    return { ok: false, problem: `${reason} at line ${line}, column ${column} (character ${position})` };
  }
}
