import { describe, expect, test } from 'vitest';
import { blockHeader, decodeRecord, parseScpiNumber } from '../../src/bench/scpi.js';

describe('SCPI numeric answers', () => {
  // IEEE 488.2 §7.7.2 decimal numeric program data: NR1 integers, NR2 fixed point, NR3 with exponent (from memory).
  test.each([
    ['+1', 1],
    ['-12', -12],
    ['12.50', 12.5],
    ['.5', 0.5],
    ['-1.234E+3', -1234],
    ['+4.99870000E+00', 4.9987],
    ['1.0e-6', 1e-6],
    ['  2.2E3  ', 2200],
  ])('%j reads as %d', (text, value) => {
    const r = parseScpiNumber(text);
    expect(r.kind).toBe('number');
    if (r.kind === 'number') expect(r.value).toBeCloseTo(value, 12); // exact decimal conversions
  });

  test('9.9E37 is the SCPI overflow value: an overload, not a number (SCPI 1999.0, from memory)', () => {
    expect(parseScpiNumber('9.9E37')).toEqual({ kind: 'overload' });
    expect(parseScpiNumber('+9.90000000E+37')).toEqual({ kind: 'overload' });
    expect(parseScpiNumber('-9.9E37')).toEqual({ kind: 'overload' });
  });

  test('an error-queue entry, text, an empty line or a list are refused with words', () => {
    const err = parseScpiNumber('-113,"Undefined header"');
    expect(err).toEqual({ kind: 'error', message: expect.stringContaining('SCPI error -113') });
    expect(parseScpiNumber('OVERLOAD')).toMatchObject({ kind: 'error', message: expect.stringContaining('not a number') });
    expect(parseScpiNumber('')).toMatchObject({ kind: 'error', message: 'answered an empty line' });
    expect(parseScpiNumber('1.0,2.0')).toMatchObject({ kind: 'error' });
    expect(parseScpiNumber('12 V')).toMatchObject({ kind: 'error' });
    expect(parseScpiNumber('1e999')).toMatchObject({ kind: 'error', message: expect.stringContaining('no finite number') });
  });

  test('a long garbage answer is cut in the message', () => {
    const r = parseScpiNumber('x'.repeat(100_000));
    expect(r.kind).toBe('error');
    if (r.kind === 'error') expect(r.message.length).toBeLessThan(120);
  });
});

describe('definite-length arbitrary blocks (IEEE 488.2 §8.7.9, from memory)', () => {
  test('the worked form #<n><length><bytes>: "#15HELLO" holds the 5 bytes HELLO', () => {
    const buf = Buffer.from('#15HELLO\n', 'latin1');
    expect(blockHeader(buf)).toEqual({ kind: 'block', start: 3, length: 5 });
    const h = blockHeader(buf);
    if (h.kind === 'block') expect(buf.subarray(h.start, h.start + h.length).toString('latin1')).toBe('HELLO');
  });

  test('incomplete and malformed headers', () => {
    expect(blockHeader(Buffer.from('#'))).toEqual({ kind: 'incomplete' });
    expect(blockHeader(Buffer.from('#3'))).toEqual({ kind: 'incomplete' });
    expect(blockHeader(Buffer.from('#3 12'))).toMatchObject({ kind: 'bad' });
    expect(blockHeader(Buffer.from('#0abc'))).toMatchObject({ kind: 'bad', message: expect.stringContaining('indefinite') });
    expect(blockHeader(Buffer.from('1,2,3'))).toMatchObject({ kind: 'bad' });
  });

  test('int8 records: signed bytes as written by Buffer.writeInt8', () => {
    const codes = [-128, -1, 0, 1, 127, 42];
    const data = Buffer.alloc(codes.length);
    for (const [i, c] of codes.entries()) data.writeInt8(c, i);
    const block = Buffer.concat([Buffer.from(`#1${codes.length}`), data]);
    expect(Array.from(decodeRecord(block, 'int8') as Float64Array)).toEqual(codes);
  });

  test('int16 records, little- and big-endian, with a length of several digits', () => {
    const codes = Array.from({ length: 600 }, (_, i) => Math.round(32767 * Math.sin((2 * Math.PI * i) / 600)));
    const le = Buffer.alloc(codes.length * 2);
    const be = Buffer.alloc(codes.length * 2);
    codes.forEach((c, i) => {
      le.writeInt16LE(c, 2 * i);
      be.writeInt16BE(c, 2 * i);
    });
    // 1200 bytes: the length field has 4 digits, so the header is "#41200".
    const header = Buffer.from('#41200');
    expect(Array.from(decodeRecord(Buffer.concat([header, le]), 'int16') as Float64Array)).toEqual(codes);
    expect(Array.from(decodeRecord(Buffer.concat([header, be]), 'int16', true) as Float64Array)).toEqual(codes);
    expect(decodeRecord(Buffer.concat([Buffer.from('#3999'), le.subarray(0, 999)]), 'int16')).toEqual({ problem: expect.stringContaining('odd') });
    expect(decodeRecord(Buffer.concat([header, le.subarray(0, 100)]), 'int16')).toEqual({ problem: expect.stringContaining('promised 1200 bytes') });
  });

  test('ASCII records: a comma list of numbers', () => {
    expect(Array.from(decodeRecord(Buffer.from('1.5,-2,3E-1, 4\n'), 'ascii') as Float64Array)).toEqual([1.5, -2, 0.3, 4]);
    expect(decodeRecord(Buffer.from('1,2,x'), 'ascii')).toEqual({ problem: expect.stringContaining('entry 3') });
  });
});
