import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { measure } from '../../src/signal/measure.js';
import { readCaptureBytes } from '../../src/signal/read-capture.js';
import { CaptureError } from '../../src/signal/types.js';

/** Read and measure; any failure must be a CaptureError with one line of text. */
function attempt(bytes: Uint8Array, name: string): 'ok' | 'refused' {
  try {
    const capture = readCaptureBytes(bytes, { name });
    for (const channel of capture.channels) measure(channel.samples, capture.sampleRate);
    return 'ok';
  } catch (error) {
    if (!(error instanceof CaptureError)) throw error;
    expect(error.message).not.toContain('\n');
    expect(error.message.length).toBeGreaterThan(10);
    return 'refused';
  }
}

const line = fc.oneof(
  fc.double({ noNaN: false }).map(String),
  fc.constantFrom('NaN', '-inf', '', ' ', 'abc', '1,2', '1;2', '1\t2', '"1"', '0,5;1,5', 'Time (s),V', '1e', '-', '.', '1e999'),
  fc.tuple(fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true })).map(([a, b]) => `${a},${b}`),
);

describe('bad files get a clear message, never a crash (property)', () => {
  test('random bytes, with and without a .wav or .csv name', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), fc.constantFrom('x.csv', 'x.wav', 'x.bin'), (bytes, name) => {
        attempt(bytes, name);
      }),
      { numRuns: 200 },
    );
  });

  test('text made of numbers, words, NaN, mixed separators and blank lines', () => {
    fc.assert(
      fc.property(fc.array(line, { maxLength: 60 }), fc.constantFrom('\n', '\r\n', '\r'), (lines, eol) => {
        attempt(new TextEncoder().encode(lines.join(eol)), 'x.csv');
      }),
      { numRuns: 200 },
    );
  });

  test('a RIFF header with random chunks after it', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), (rest) => {
        const head = new TextEncoder().encode('RIFF\u0000\u0000\u0000\u0000WAVE');
        const bytes = new Uint8Array(head.length + rest.length);
        bytes.set(head);
        bytes.set(rest, head.length);
        attempt(bytes, 'x.wav');
      }),
      { numRuns: 200 },
    );
  });

  test('known bad files', () => {
    expect(attempt(new Uint8Array(0), 'empty.csv')).toBe('refused');
    expect(attempt(new TextEncoder().encode('1\n2\n3\n'), 'one-column.csv')).toBe('refused');
    expect(attempt(new TextEncoder().encode('0,1\n1,NaN\n2,3\n'), 'nan.csv')).toBe('refused');
    expect(attempt(new TextEncoder().encode('0,1\n1;2\n2,3\n'), 'mixed.csv')).toBe('refused');
    expect(attempt(new TextEncoder().encode('0,1\n1,2\n2,3\n'), 'short.csv')).toBe('refused');
  });

  // Issue 10, item 16: the cases found by an attack on the notebook, as fixed examples.
  test('one endless line says so, not "no rows of numbers in the first 0 lines"', () => {
    const endless = new TextEncoder().encode('1,'.repeat(200_000));
    expect(() => readCaptureBytes(endless, { name: 'endless.csv' })).toThrow(/endless\.csv: no line end in the first \d+ KB/);
  });

  test('a file with CR-only line ends is read like LF', () => {
    const rows = Array.from({ length: 64 }, (_, i) => `${(i * 1e-4).toFixed(4)},${Math.sin(i / 3).toFixed(6)}`);
    const cr = readCaptureBytes(new TextEncoder().encode(`Time (s),CH1 (V)\r${rows.join('\r')}\r`), { name: 'cr.csv' });
    const lf = readCaptureBytes(new TextEncoder().encode(`Time (s),CH1 (V)\n${rows.join('\n')}\n`), { name: 'lf.csv' });
    expect(cr.channels[0]?.samples).toEqual(lf.channels[0]?.samples);
    expect(cr.sampleRate).toBe(lf.sampleRate);
  });

  test('a bad row is quoted cut short, never in full', () => {
    const text = `0,1\n1,2\n2,${'x'.repeat(130_000)}\n3,4\n`;
    try {
      readCaptureBytes(new TextEncoder().encode(text), { name: 'long.csv' });
      throw new Error('read');
    } catch (error) {
      expect(error).toBeInstanceOf(CaptureError);
      expect((error as Error).message.length).toBeLessThan(300);
    }
  });
});
