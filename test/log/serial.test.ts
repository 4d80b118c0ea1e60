import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { maxSerialLength, validateSerial } from '../../src/log/serial.js';

describe('validateSerial', () => {
  test.each(['EXB-0042', 'sn_7', 'A', 'rev.B-12', 'x'.repeat(maxSerialLength)])('accepts %s', (serial) => {
    expect(validateSerial(serial)).toBeNull();
  });

  test.each([
    ['', /empty/],
    ['a/b', /path separator "\/"/],
    ['a\\b', /path separator "\\"/],
    ['..', /"\.\."/],
    ['a..b', /"\.\."/],
    ['.hidden', /starts with "\."/],
    ['end.', /ends with "\."/],
    ['-x', /starts with "-"/],
    ['tab\there', /control character \(U\+0009\)/],
    ['nul\u0000', /control character \(U\+0000\)/],
    ['sp ace', /contains " "/],
    ['Größe', /contains "ö"/],
    ['x'.repeat(maxSerialLength + 1), /at most 64/],
    ['CON', /reserved device name/],
    ['nul.1', /reserved device name/],
  ])('refuses %j', (serial, pattern) => {
    expect(validateSerial(serial)).toMatch(pattern);
  });

  test('property: never throws; every rejection is one line; every acceptance is a safe file name', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.string({ maxLength: 80 }), fc.string({ unit: 'binary', maxLength: 80 }), fc.stringMatching(/^[A-Za-z0-9._\-/\\]{0,70}$/)),
        (text) => {
          const message = validateSerial(text);
          if (message === null) {
            expect(text).toMatch(/^[A-Za-z0-9_][A-Za-z0-9._-]*$/);
            expect(text.length).toBeLessThanOrEqual(maxSerialLength);
            expect(text).not.toContain('..');
            expect(text.endsWith('.')).toBe(false);
          } else {
            expect(message.length).toBeGreaterThan(0);
            expect(message).not.toMatch(/[\n\r]/);
          }
        },
      ),
      { numRuns: 2000, seed: 4242 },
    );
  });
});
