import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { findJsonFault, lineColumn } from '../../src/plan/json-position.js';

/** Whether V8's own parser (the reference) accepts the text. */
function v8Accepts(text: string): boolean {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
}

describe('findJsonFault', () => {
  test('agrees with JSON.parse on random valid JSON and on damaged copies (fast-check)', () => {
    fc.assert(
      fc.property(fc.json(), fc.nat(), fc.constantFrom('', ',', '}', ']', '"', ':', 'x', '\n'), (text, at, junk) => {
        expect(findJsonFault(text)).toBeUndefined();
        const i = text.length === 0 ? 0 : at % text.length;
        const damaged = text.slice(0, i) + junk + text.slice(i + (junk === '' ? 1 : 0));
        expect(findJsonFault(damaged) === undefined).toBe(v8Accepts(damaged));
      }),
      { numRuns: 300, seed: 7 },
    );
  });

  test('points at the first offending character, 1-based', () => {
    expect(findJsonFault('{\n  "a": 1\n  "b": 2\n}')).toEqual({ line: 3, column: 3, expected: "',' or '}' after the property value" });
    expect(findJsonFault('{"a": [1, 2,]}')).toMatchObject({ line: 1, column: 13 });
    expect(findJsonFault('{"a": "open\n"}')).toMatchObject({ line: 1, column: 12 });
    expect(findJsonFault('')).toMatchObject({ line: 1, column: 1 });
    expect(findJsonFault('{} {}')).toMatchObject({ line: 1, column: 4, expected: 'the end of the file after the top-level object' });
  });

  test('lineColumn counts lines from 1', () => {
    expect(lineColumn('ab\ncd', 4)).toEqual({ line: 2, column: 2 });
  });
});
