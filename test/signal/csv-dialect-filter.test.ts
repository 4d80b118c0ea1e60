import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { isNumericRow, lineMask, mayBeNumericRow } from '../../src/signal/csv-dialect.js';

// The dialect detection rules a candidate out for a line from the characters
// it holds before it splits the line and runs the number pattern
// (src/signal/csv-dialect.ts). That shortcut must never rule out a line the
// pattern takes: whenever it says no, the full test says no too.
const candidates = [
  { delimiter: ',', decimal: '.' },
  { delimiter: ';', decimal: '.' },
  { delimiter: '\t', decimal: '.' },
  { delimiter: ';', decimal: ',' },
  { delimiter: '\t', decimal: ',' },
] as const;

// Digits, signs, exponents, quotes, every separator, ASCII white space, a few
// letters and symbols, and spaces outside ASCII that \s takes (no-break, em space).
const alphabet = [...'0123456789+-eE".,;\t \r\v\f', 'x', 'V', 's', '#', ':', '/', '\u00a0', '\u2003', '\u0001', 'µ'];

describe('the dialect pre-filter', () => {
  test('never rules out a line that the number pattern takes (any candidate)', () => {
    const line = fc.array(fc.constantFrom(...alphabet), { maxLength: 24 }).map((cs) => cs.join(''));
    fc.assert(
      fc.property(line, (l) => {
        const mask = lineMask(l);
        for (const c of candidates) if (!mayBeNumericRow(mask, c.delimiter, c.decimal)) expect(isNumericRow(l, c.delimiter, c.decimal)).toBe(0);
      }),
      { numRuns: 20_000 },
    );
  });

  test('lets through the rows of numbers of each dialect and rules out the other dialects', () => {
    const rows = { ',.': '1.5e-3,-2.25', ';.': '1.5e-3;-2.25', '\t.': '1.5e-3\t-2.25', ';,': '1,5e-3;-2,25', '\t,': '1,5e-3\t-2,25' } as const;
    for (const c of candidates) {
      const own = rows[`${c.delimiter}${c.decimal}` as keyof typeof rows];
      expect(mayBeNumericRow(lineMask(own), c.delimiter, c.decimal)).toBe(true);
      expect(isNumericRow(own, c.delimiter, c.decimal)).toBe(2);
    }
    // A comma-separated row with decimal points is no row under `;` with either marker.
    expect(mayBeNumericRow(lineMask('1.5,2.5'), ';', '.')).toBe(false);
    expect(mayBeNumericRow(lineMask('1.5,2.5'), ';', ',')).toBe(false);
    // A header is ruled out everywhere; a no-break space (which \s takes) rules nothing out.
    for (const c of candidates) expect(mayBeNumericRow(lineMask('Time (s),CH1 (V)'), c.delimiter, c.decimal)).toBe(false);
    expect(mayBeNumericRow(lineMask('\u00a01.5'), ';', '.')).toBe(true);
  });
});
