import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { CsvParser } from '../../src/signal/csv-parser.js';
import { componentAt, componentsAt } from '../../src/signal/harmonics.js';
import { plainValue, scan, scanNumber, scanPlain } from '../../src/signal/number-scan.js';
import { readCaptureBytes } from '../../src/signal/read-capture.js';
import { CaptureError } from '../../src/signal/types.js';

const encode = (text: string): Uint8Array => new TextEncoder().encode(text);

describe('scanPlain, the fast number path', () => {
  // Up to 15 significant digits and a decimal exponent within ±22, a decimal
  // number is an exact integer times or over an exact power of ten, so one
  // IEEE 754 operation rounds it correctly (Clinger's fast path, W. D. Clinger,
  // PLDI 1990, from memory); ECMAScript's Number() is correctly rounded by
  // definition (ECMA-262 §7.1.4.1.1). The two must agree to the last bit.
  test('equals Number() (correctly rounded) and scanNumber for plain fields of up to 15 digits', () => {
    const field = fc
      .record({
        sign: fc.constantFrom('', '-', '+'),
        int: fc.stringMatching(/^[0-9]{0,7}$/),
        frac: fc.stringMatching(/^[0-9]{0,7}$/),
        dot: fc.boolean(),
        exp: fc.option(fc.integer({ min: -7, max: 7 }), { nil: undefined }),
      })
      .filter((r) => r.int.length + r.frac.length > 0 && (r.dot || r.frac === ''));
    fc.assert(
      fc.property(field, (r) => {
        const text = `${r.sign}${r.int}${r.dot ? '.' : ''}${r.frac}${r.exp === undefined ? '' : `e${r.exp}`}`;
        const bytes = encode(`${text},\n`);
        const end = scanPlain(bytes, 0, 46);
        expect(end).toBe(text.length);
        const fast = plainValue[0];
        expect(Object.is(fast, Number(text))).toBe(true);
        expect(Object.is(fast, scanNumber(bytes, 0, bytes.length, 46))).toBe(true);
        expect(scan.end).toBe(text.length);
      }),
    );
  });

  test('leaves every other form to scanNumber', () => {
    for (const text of [' 1.5', '"2.5"', '1.5e', '-', '.', '', '1234567890.1234567', 'nan', 'inf']) {
      expect(scanPlain(encode(`${text}\n`), 0, 46), text).toBe(-1);
    }
    // A decimal comma under the `;` dialect.
    expect(scanPlain(encode('3,25;\n'), 0, 44)).toBe(4);
    expect(plainValue[0]).toBe(3.25);
  });
});

describe('the CSV row loop', () => {
  // Rows the fast path takes, rows it leaves to the exact reader (spaces,
  // quotes, 17 digits, blank lines) and rows far shorter than the head's, so the
  // arrays sized from the file length must grow. Checked against csv-parse (an
  // independent CSV library) and Number().
  test.each([3, 2])('mixed rows across many chunks read as csv-parse and Number() read them (%i columns)', (columns) => {
    const lines = [columns === 3 ? 'Time (s),CH1 (V),CH2 (V)' : 'Time (s),CH1 (V)'];
    const third = (text: string): string => (columns === 3 ? `,${text}` : '');
    // A head of long rows makes the length-based estimate of the row count far too small.
    for (let i = 0; i < 3000; i++) lines.push(`${(i * 1e-6).toExponential(12)},${Math.sin(i / 10).toFixed(12)}${third((i / 7).toFixed(12))}`);
    for (let i = 3000; i < 60000; i++) {
      const t = `${i}e-6`;
      const v = (Math.round(Math.sin(i / 10) * 1000) / 1000).toString();
      if (i % 997 === 0) lines.push(` ${t}, "${v}" ${third(String(i % 5))}`);
      else if (i % 1009 === 0) lines.push(`${t},${Math.sin(i).toPrecision(17)}${third(String(i % 5))}`);
      else if (i % 1013 === 0) lines.push(`${t},${v}${third(String(i % 5))}\r`);
      else lines.push(`${t},${v}${third(String(i % 5))}`);
      if (i % 4999 === 0) lines.push('');
    }
    const text = `${lines.join('\n')}\n`;
    // Pushed in odd-sized chunks, so rows straddle chunk ends.
    const all = encode(text);
    const parser = new CsvParser({ name: 'mixed.csv' }, all.length);
    for (let at = 0; at < all.length; at += 7777) parser.push(all.subarray(at, at + 7777));
    const c = parser.end();
    const rows = (parse(text, { from_line: 2, skip_empty_lines: true, trim: true }) as string[][]).map((r) => r.map((f) => Number(f.replace(/"/g, ''))));
    expect(c.channels[0]?.samples.length).toBe(rows.length);
    const a = c.channels[0]?.samples ?? new Float64Array(0);
    const b = c.channels[1]?.samples ?? new Float64Array(0);
    let worst = 0;
    for (let i = 0; i < rows.length; i++) {
      const row = rows[i] ?? [];
      // Fields of up to 15 digits are exact; longer ones within a few ulps (number-scan.ts).
      worst = Math.max(worst, Math.abs((a[i] ?? Number.NaN) - (row[1] ?? 0)) / Math.max(1e-300, Math.abs(row[1] ?? 0)));
      if (columns === 3) expect(b[i]).toBe(row[2]);
    }
    expect(worst).toBeLessThan(1e-15);
    expect(c.sampleRate).toBeCloseTo(1e6, 3);
  });

  test('a bad row past the fast rows is reported with its line number', () => {
    const rows = ['t,v'];
    for (let i = 0; i < 5000; i++) rows.push(`${i},${i % 3}`);
    rows.push('5000,1.2.3');
    expect(() => readCaptureBytes(encode(`${rows.join('\n')}\n`), { name: 'bad.csv' })).toThrow(
      new CaptureError('bad.csv, line 5002: field 2 is not a number in "5000,1.2.3"; expected 2 numbers separated by "," with "." as the decimal marker'),
    );
    // After the arrays have grown (long rows first make the estimate short), the line is still right.
    const grown = ['t,v'];
    for (let i = 0; i < 3000; i++) grown.push(`${i}.000000000000,${(i % 3).toFixed(12)}`);
    for (let i = 3000; i < 40000; i++) grown.push(`${i},${i % 3}`);
    grown.push('40000,x');
    expect(() => readCaptureBytes(encode(`${grown.join('\n')}\n`), { name: 'grown.csv' })).toThrow(/^grown\.csv, line 40002: field 2 is not a number/);
    rows[5001] = '4999,1';
    expect(() => readCaptureBytes(encode(`${rows.join('\n')}\n`), { name: 'bad.csv' })).toThrow(
      /line 5002: time 4999 does not increase \(the row before had 4999\)/,
    );
  });
});

describe('componentsAt', () => {
  test('gives each frequency exactly what componentAt gives alone, in any batch', () => {
    const n = 3 * 4096 + 123;
    const x = Float64Array.from({ length: n + 50 }, (_, i) => Math.sin(i / 17.3) + 0.3 * Math.sin((3 * i) / 17.3 + 1) + 0.01 * Math.cos(i * 1.7));
    const nus = Float64Array.from({ length: 7 }, (_, k) => (k + 1) / (2 * Math.PI * 17.3));
    const batch = componentsAt(x, 20, n, nus, 0.05);
    for (let k = 0; k < nus.length; k++) expect(batch[k]).toBe(componentAt(x, 20, n, nus[k] ?? 0, 0.05).amplitude);
    // The fundamental's amplitude, 1 V as generated (invented signal).
    expect(batch[0]).toBeCloseTo(1, 2);
  });
});
