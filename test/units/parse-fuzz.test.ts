import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { formatValue } from '../../src/units/format.js';
import { maxValueLength, parseValue } from '../../src/units/parse.js';
import type { Unit } from '../../src/units/unit.js';

// Fuzzing the value parser: no input is ever saved as a number the user did not
// write. The fixed examples are the cases found by an attack on the notebook
// (issue 10); the properties explore around them from the fixed seed (test/setup.ts).

const units: readonly Unit[] = ['V', 'A', 'Hz', 's', 'Ω', 'F', 'H', 'W', 'V/s', 'V/V', '1'];

describe('a space never joins digits', () => {
  // Each of these was once saved as a different, plausible number (12 V, 1.205 kV, 4.7 kV, 125 V).
  test.each(['1 2', '12 05', '4 k 7', '12\n5', '1 000', '4 k7', '1 2 V', '- 12', '1\t2', '12 5%', '0. 5', '1e 3'])(
    '%j is refused, naming what was typed',
    (text) => {
      const r = parseValue(text, { expected: 'V', allowTolerance: false });
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.message).toContain(JSON.stringify(text));
    },
  );

  test('the message says what to write instead', () => {
    const r = parseValue('1 2', { expected: 'V' });
    expect(!r.ok && r.message).toMatch(/space.*(digits|number)/);
  });

  test.each(['1 2', '4 k 7', '12 05', '1 2 V', '4 MHz 3O%', '1 2 x', '4 k 7 zz'])(
    '%j: every reading offered instead parses, and no junk is offered',
    (text) => {
      const r = parseValue(text, { expected: 'V' });
      expect(r.ok).toBe(false);
      const offered = !r.ok ? (/write (\S+)(?: or (\S+))? \(/.exec(r.message)?.slice(1) ?? []) : [];
      for (const o of offered.filter((x) => x !== undefined)) expect(parseValue(o, { expected: 'V' }).ok, `${o} offered for ${text}`).toBe(true);
      if (['4 MHz 3O%', '1 2 x', '4 k 7 zz'].includes(text)) expect(!r.ok && r.message).toMatch(/is not a value/);
    },
  );

  // A space may separate the number from its unit or prefix, or the value from its tolerance.
  test.each([
    ['12 V', 'V', 12],
    ['4.98 k', 'Ω', 4980],
    ['4k7 V', 'V', 4700],
    ['10 k ohm', 'Ω', 10e3],
    ['0.5 V/us', 'V/s', 5e5],
    [' 12.1 ', 'V', 12.1],
    ['-11.95 V', 'V', -11.95],
    ['1e3 Hz', 'Hz', 1000],
  ] as const)('%j is still %s', (text, unit, expected) => {
    const r = parseValue(text, { expected: unit });
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(expected, 9);
  });

  test('a tolerance after a space is still read in plans', () => {
    const r = parseValue('4k7 1%', { expected: 'Ω' });
    expect(r.ok && r.value).toBe(4700);
    expect(r.ok && r.tol).toBeCloseTo(0.01, 12);
  });
});

describe('a comma before exactly three digits is ambiguous', () => {
  test.each([
    ['1,500', '1.5', '1500'],
    ['-2,250 V', '-2.25 V', '-2250 V'],
    ['12,000', '12.0', '12000'],
  ])('%j is refused: write %s or %s', (text, a, b) => {
    const r = parseValue(text, { expected: 'V' });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toContain(`write ${a} or ${b}`);
      expect(r.message).not.toContain('\n');
    }
  });

  test.each([
    ['1,5', 1.5],
    ['4,98', 4.98],
    ['1,5000', 1.5],
    ['0,25 V', 0.25],
  ])('%j is not ambiguous: %d', (text, expected) => {
    const r = parseValue(text, { expected: 'V' });
    expect(r.ok && r.value).toBeCloseTo(expected, 12);
  });

  test('where the bench writes decimal commas, 1,500 is 1.5', () => {
    const r = parseValue('1,500', { expected: 'V', decimalComma: true });
    expect(r.ok && r.value).toBe(1.5);
    const k = parseValue('4,700 k', { expected: 'Ω', decimalComma: true });
    expect(k.ok && k.value).toBe(4700);
  });

  test('thousands separators are never read', () => {
    for (const text of ['1,500,000', '1,500.5']) expect(parseValue(text, { expected: 'V', decimalComma: true }).ok).toBe(false);
  });
});

describe('long and hostile input', () => {
  test(`a value longer than ${maxValueLength} characters is refused, and the echo is cut`, () => {
    const text = `1${'0'.repeat(5000)}`;
    const r = parseValue(text, { expected: 'V' });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toContain(String(maxValueLength));
      expect(r.message.length).toBeLessThan(300);
    }
  });

  test('a long run of spaces before a percent sign is refused without backtracking (item 13)', () => {
    // Once 24 s for 130 k spaces: the tolerance pattern was quadratic. Now the length cap
    // refuses it and the tolerance is found by a linear scan; this finishes in well under
    // the test timeout (no timing asserted here, see bench/).
    for (const n of [150, 130_000]) {
      const r = parseValue(`1${' '.repeat(n)}1%`, { expected: 'V' });
      expect(r.ok).toBe(n === 150);
    }
    const spaced = parseValue(`1${' '.repeat(150)}%`, { expected: 'V' });
    expect(spaced.ok).toBe(false);
  });

  test('control characters are refused, not read around', () => {
    for (const text of ['12\u0000', '1\u001b[31m2', '12\u0007 V']) expect(parseValue(text, { expected: 'V' }).ok).toBe(false);
  });

  test('never throws and never accepts a non-finite value (property)', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.string({ maxLength: 30 }),
          fc.string({ unit: fc.constantFrom('1', '2', '0', ' ', ',', '.', '-', 'k', 'V', '%', 'e', '\n', 'R', 'µ'), maxLength: 16 }),
        ),
        fc.constantFrom<Unit | undefined>(...units, undefined),
        fc.boolean(),
        (text, unit, decimalComma) => {
          const r = parseValue(text, { ...(unit ? { expected: unit } : {}), decimalComma });
          if (!r.ok) return r.message.length > 0 && !r.message.includes('\n');
          return Number.isFinite(r.value) && (unit === undefined || r.unit === unit);
        },
      ),
      { numRuns: 3000 },
    );
  });

  test('digits separated by whitespace are never accepted (property)', () => {
    fc.assert(
      fc.property(
        fc.nat({ max: 9999 }),
        fc.nat({ max: 9999 }),
        fc.constantFrom(' ', '  ', '\t', '\n', ' \u00a0'),
        fc.constantFrom('', ' V', 'V', ' mV'),
        (a, b, gap, unit) => {
          return !parseValue(`${a}${gap}${b}${unit}`, { expected: 'V' }).ok;
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('what the parser accepts round-trips through the formatter', () => {
  // Any accepted text, formatted with 12 significant digits (the precision parseValue keeps)
  // and parsed again, gives back the same number exactly.
  const token = fc.constantFrom(
    '0',
    '1',
    '2',
    '4',
    '5',
    '7',
    '9',
    '.',
    ',',
    '-',
    '+',
    'e',
    ' ',
    'k',
    'm',
    'u',
    'µ',
    'n',
    'p',
    'M',
    'meg',
    'R',
    'V',
    'A',
    'Hz',
    'F',
    'ohm',
    'Ω',
    's',
    '%',
    'V/us',
  );
  const candidate = fc.array(token, { minLength: 1, maxLength: 8 }).map((parts) => parts.join(''));
  // Shaped like a value: sign, digits, decimal point or comma, exponent, space, prefix, unit.
  const shaped = fc
    .tuple(
      fc.constantFrom('', '-', '+'),
      fc.stringMatching(/^\d{1,6}$/),
      fc.constantFrom('', '.', ',').chain((mark) => (mark === '' ? fc.constant('') : fc.stringMatching(/^\d{1,5}$/).map((d) => `${mark}${d}`))),
      fc.constantFrom('', 'e3', 'e-6', 'E+2'),
      fc.constantFrom('', ' '),
      fc.constantFrom('', 'k', 'm', 'u', 'µ', 'n', 'p', 'M', 'meg', 'G'),
      fc.constantFrom('', 'V', 'A', 'Hz', 'F', 'ohm', 'Ω', 's', 'H', 'W', 'V/us', 'V/V', '%'),
    )
    .map((parts) => parts.join(''));

  test('formatted and parsed again, the number is the same (property)', () => {
    let accepted = 0;
    fc.assert(
      fc.property(
        fc.oneof(candidate, shaped, shaped, fc.double({ noNaN: true, noDefaultInfinity: true }).map(String)),
        fc.constantFrom<Unit | undefined>(...units, undefined),
        fc.boolean(),
        (text, unit, decimalComma) => {
          const first = parseValue(text, { ...(unit ? { expected: unit } : {}), decimalComma, allowTolerance: false });
          if (!first.ok) return true;
          accepted++;
          const shown = formatValue(first.value, first.unit, { digits: 12 });
          const again = parseValue(shown, { expected: first.unit, allowTolerance: false });
          return again.ok && again.value === first.value && again.unit === first.unit;
        },
      ),
      { numRuns: 4000 },
    );
    // The property is only worth something if the generator reaches accepted values often.
    expect(accepted).toBeGreaterThan(400);
  });
});
