import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { dividerKind } from '../../src/circuit/divider.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';

function run(top: number, bottom: number, rail: number, from = '+12V') {
  return dividerKind.evaluate({
    parts: { Rtop: top, Rbottom: bottom },
    settings: { from },
    opamp: defaultOpamp,
    supplies: { pos: 12, neg: -12 },
    rails: { '+12V': rail, '-12V': -rail },
  });
}

describe('divider', () => {
  test('10k over 4k7 from 12 V gives 3.837 V (closed form V·Rb/(Rt + Rb))', () => {
    // Divider closed form V·Rb/(Rt + Rb) (any circuits handbook).
    expect(run(10e3, 4.7e3, 12).values['out.dc']).toBeCloseTo((12 * 4.7) / 14.7, 12);
  });

  test('closed form over random values, and from a negative rail', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e6, noNaN: true }),
        fc.double({ min: 1, max: 1e6, noNaN: true }),
        fc.double({ min: -30, max: 30, noNaN: true }),
        (t, b, v) => {
          const got = run(t, b, v).values['out.dc'] as number;
          // Independent form: the current V/(Rt + Rb) through Rb.
          expect(got).toBeCloseTo((v / (t + b)) * b, 9);
        },
      ),
      { numRuns: 200 },
    );
    // Equal halves from the −15 V rail: half the rail, −7.5 V (divider formula, by hand).
    expect(run(10e3, 10e3, 15, '-12V').values['out.dc']).toBeCloseTo(-7.5, 12);
  });

  test('a rail the plan does not have is named in the failure', () => {
    expect(() => run(1e3, 1e3, 12, '+5V')).toThrow(/"\+5V".*rails: "\+12V", "-12V"/);
  });

  test.each([
    [{ parts: { Rtop: '10k', Rbottom: '4k7' } }, /stages\[0\]\.from: missing/],
    [{ parts: { Rtop: '10k' }, from: '+12V' }, /stages\[0\]\.parts\.Rbottom: missing/],
    [{ parts: { Rtop: '10k', Rbottom: '4k7' }, from: 12 }, /stages\[0\]\.from: must be text/],
  ])('plan error %j', (json, message) => {
    const parse = () => dividerKind.parse({ json, path: 'stages[0]' }, 'x.plan.json');
    expect(parse).toThrow(StageParseError);
    expect(parse).toThrow(message);
  });
});
