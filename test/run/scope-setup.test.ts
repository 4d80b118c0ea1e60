import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { scopeSetup, upTo125 } from '../../src/run/scope-setup.js';

// The 1-2-5 sequence of scope ranges (common practice, no source), listed independently.
const ladder: number[] = [];
for (let e = -9; e <= 3; e++) for (const m of [1, 2, 5]) ladder.push(Number(`${m}e${e}`));

describe('1-2-5 ranges', () => {
  test('upTo125 picks the smallest ladder value at or above x (against a listed ladder)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1.01e-9, max: 900, noNaN: true }), (x) => {
        const expected = ladder.find((v) => v >= x * (1 - 1e-9));
        expect(upTo125(x)).toBeCloseTo(expected ?? Number.NaN, 15);
      }),
      { numRuns: 300, seed: 3 },
    );
    expect(upTo125(2e-3)).toBe(2e-3);
    expect(upTo125(0)).toBeNaN();
  });

  test('a 2.5 kHz, 9.2 Vpp square: two periods over 10 div, six of 8 div', () => {
    // Hand-worked from the bench habit of two periods across the 10 horizontal divisions and the
    // signal over about six of the 8 vertical ones (common practice, no source).
    // 2 periods = 800 µs over 10 div = 80 µs/div → 100 µs/div; 9.2/6 = 1.53 V → 2 V/div.
    expect(scopeSetup(2500, 9.2)).toEqual({ timePerDiv: 1e-4, voltsPerDiv: 2 });
    // 1 kHz, 1 Vpp: 200 µs/div exactly, 0.167 V → 200 mV/div.
    expect(scopeSetup(1000, 1)).toEqual({ timePerDiv: 2e-4, voltsPerDiv: 0.2 });
    expect(scopeSetup(0, 1)).toBeNull();
  });
});
