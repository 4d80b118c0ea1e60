import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { CsvParser } from '../../src/signal/csv-parser.js';
import { readCaptureBytes } from '../../src/signal/read-capture.js';
import { CaptureError } from '../../src/signal/types.js';

const bytes = (text: string): Uint8Array => new TextEncoder().encode(text);
const read = (text: string, options = {}) => readCaptureBytes(bytes(text), { name: 't.csv', ...options });

describe('CSV dialects', () => {
  test('comma, header with units in brackets and parentheses, time in seconds', () => {
    const c = read('Time (s),CH1 [V],CH2 (mV)\n0,1.5,100\n1e-6,2.5,-200\n2e-6,3.5,300\n');
    // The sample interval written in the invented file.
    expect(c.dt).toBeCloseTo(1e-6, 18);
    expect(c.channels.map((ch) => ch.name)).toEqual(['CH1', 'CH2']);
    expect(Array.from(c.channels[0]?.samples ?? [])).toEqual([1.5, 2.5, 3.5]);
    // mV to V: SI prefix milli = 1e-3 (BIPM SI Brochure).
    expect(Array.from(c.channels[1]?.samples ?? []).map((v) => Number(v.toPrecision(12)))).toEqual([0.1, -0.2, 0.3]);
  });

  test('semicolons with decimal commas, a preamble and CRLF line ends', () => {
    const c = read('Instrument;invented\r\nSample Interval;0,000002\r\n\r\nOUT [V]\r\n1,25\r\n-2,5\r\n3,75\r\n');
    // The sample interval written in the invented file.
    expect(c.dt).toBeCloseTo(2e-6, 18);
    expect(c.channels).toHaveLength(1);
    expect(Array.from(c.channels[0]?.samples ?? [])).toEqual([1.25, -2.5, 3.75]);
  });

  test('tabs, time in ms, volts in mV, comment lines before the header', () => {
    const c = read('# invented\nt [ms]\tOUT [mV]\n0\t1000\n0.5\t-500\n1.0\t250\n');
    // The sample interval written in the invented file.
    expect(c.dt).toBeCloseTo(0.5e-3, 15);
    expect(Array.from(c.channels[0]?.samples ?? [])).toEqual([1, -0.5, 0.25]);
  });

  test('no header: the first column is time when there are two; --dt makes every column a channel', () => {
    const c = read('0,1\n0.001,2\n0.002,3\n');
    // The sample interval written in the invented file.
    expect(c.dt).toBeCloseTo(0.001, 15);
    expect(c.channels).toHaveLength(1);
    const d = read('5,1\n6,2\n7,3\n', { dt: 1e-3 });
    expect(d.channels).toHaveLength(2);
    // 1/dt of the invented file.
    expect(d.sampleRate).toBeCloseTo(1000, 9);
  });

  test('a UTF-8 byte-order mark before the first row', () => {
    const c = readCaptureBytes(new Uint8Array([0xef, 0xbb, 0xbf, ...bytes('0,1\n1e-3,2\n2e-3,3\n')]), { name: 'bom.csv' });
    expect(Array.from(c.channels[0]?.samples ?? [])).toEqual([1, 2, 3]);
  });

  test('units on their own line under the names', () => {
    const c = read('X,CH1,CH2\nSecond,Volt,mV\n0,1,1000\n0.001,-2,-2000\n0.002,3,3000\n');
    expect(c.sampleRate).toBe(1000);
    expect(c.channels.map((ch) => `${ch.name} ${ch.unit}`)).toEqual(['CH1 V', 'CH2 V']);
    expect(Array.from(c.channels[1]?.samples ?? [])).toEqual([1, -2, 3]);
  });

  test('one column needs --dt, and says so', () => {
    expect(() => read('1\n2\n3\n')).toThrow(/give the sample interval with --dt/);
    expect(read('1\n2\n3\n', { dt: 1e-6 }).channels[0]?.samples.length).toBe(3);
  });

  test('quoted numbers and a trailing separator on every row', () => {
    const c = read('"Time (s)","CH1 (V)",\n"0","1.5",\n"0.1","2.5",\n');
    expect(Array.from(c.channels[0]?.samples ?? [])).toEqual([1.5, 2.5]);
  });

  test('irregular time steps give a warning, a time going backwards an error with its line', () => {
    expect(read('t (s),v\n0,1\n1,2\n3,1\n4,2\n').warnings.join(' ')).toMatch(/time steps vary/);
    expect(() => read('t (s),v\n0,1\n1,2\n0.5,1\n')).toThrow(/line 4: time 0.5 does not increase/);
  });
});

describe('bad rows are reported with their line number', () => {
  test.each([
    ['a word in a row', 'Time (s),V\n0,1\n1e-3,abc\n2e-3,3\n', /line 3: field 2 is not a number/],
    ['NaN', 'Time (s),V\n0,1\n1e-3,NaN\n', /line 3: field 2 is not a number/],
    ['too many fields', 'Time (s),V\n0,1\n1e-3,2,3\n', /line 3: more than 2 fields/],
    ['too few fields', 'Time (s),V\n0,1\n1e-3\n', /line 3: only 1 of 2 fields/],
    ['mixed delimiters', '0,1\n1,2\n2;3\n', /line 3: field 1 is not a number/],
  ])('%s', (_name, text, message) => {
    expect(() => read(text)).toThrow(CaptureError);
    expect(() => read(text)).toThrow(message);
  });

  test('empty, blank and binary files', () => {
    expect(() => read('')).toThrow(/the file is empty/);
    expect(() => read('\n\n  \n')).toThrow(/no rows of numbers/);
    expect(() => readCaptureBytes(new Uint8Array([0, 1, 2, 200, 0, 7]), { name: 'x.bin' })).toThrow(/binary data, neither CSV text nor a WAV file/);
  });
});

describe('numbers as csv-parse and Number() read them', () => {
  test('random values in many notations (property)', () => {
    const value = fc.oneof(
      fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }).map((v) => v.toString()),
      fc.double({ min: -10, max: 10, noNaN: true }).map((v) => v.toExponential(8)),
      fc.double({ min: -10, max: 10, noNaN: true }).map((v) => v.toFixed(6)),
      fc.double({ min: -1, max: 1, noNaN: true }).map((v) => v.toPrecision(17)),
      fc.integer({ min: -99999, max: 99999 }).map(String),
    );
    fc.assert(
      fc.property(fc.array(fc.tuple(value, value), { minLength: 1, maxLength: 60 }), (rows) => {
        const text = `A,B\n${rows.map(([a, b]) => `${a},${b}`).join('\n')}\n`;
        const c = read(text, { dt: 1e-3 });
        // csv-parse (an independent library) splits the fields; Number() reads them.
        const reference = parse(text, { from_line: 2 }) as string[][];
        reference.forEach((row, i) => {
          row.forEach((field, col) => {
            const expected = Number(field);
            const got = c.channels[col]?.samples[i] ?? Number.NaN;
            // Within a few units in the last place (see number-scan.ts).
            expect(Math.abs(got - expected)).toBeLessThanOrEqual(4 * Number.EPSILON * Math.abs(expected) + 1e-300);
          });
        });
      }),
      { numRuns: 60 },
    );
  });

  test('chunk boundaries anywhere give the same samples (property)', () => {
    const text = `# invented\nTime (s);CH1 (V);CH2 (V)\n${Array.from(
      { length: 300 },
      (_, i) =>
        `${(i * 1e-5).toFixed(6).replace('.', ',')};${Math.sin(i / 7)
          .toFixed(5)
          .replace('.', ',')};${(i % 13) - 6}`,
    ).join('\n')}\n`;
    const whole = read(text);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 400 }), { minLength: 1, maxLength: 40 }), (sizes) => {
        const data = bytes(text);
        const parser = new CsvParser({ name: 't.csv' }, data.length);
        let at = 0;
        for (let k = 0; at < data.length; k++) {
          const size = sizes[k % sizes.length] ?? 1;
          parser.push(data.slice(at, at + size));
          at += size;
        }
        const c = parser.end();
        // The same file read whole and in chunks must agree exactly (no outside figure).
        expect(c.dt).toBeCloseTo(whole.dt, 15);
        expect(Array.from(c.channels[0]?.samples ?? [])).toEqual(Array.from(whole.channels[0]?.samples ?? []));
        expect(Array.from(c.channels[1]?.samples ?? [])).toEqual(Array.from(whole.channels[1]?.samples ?? []));
      }),
      { numRuns: 30 },
    );
  });
});
