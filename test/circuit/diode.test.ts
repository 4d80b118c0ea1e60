import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { defaultDiode, diodeString, stringCurrent, stringVoltage, thermalVoltage } from '../../src/circuit/diode.js';
import { branchJunction } from '../../src/circuit/shaper-solver.js';
import { runSpice } from '../helpers/ngspice.js';

describe('diode law', () => {
  test('thermal voltage kT/q at 27 °C (300.15 K, as ngspice takes it) is 25.865 mV', () => {
    // k = 1.380649e-23 J/K and q = 1.602176634e-19 C, exact in the 2019 SI (BIPM SI Brochure);
    // the often-quoted 25.85 mV is the same at 300 K.
    expect(thermalVoltage()).toBeCloseTo(0.0258649, 6);
    expect(thermalVoltage(300)).toBeCloseTo(0.025852, 6);
  });

  test('the default is the 1N4148 SPICE model of data/diode-models.json', () => {
    expect(defaultDiode).toEqual({ is: 2.52e-9, n: 1.752, rs: 0.568 });
  });

  test('two diodes and a resistor in series against an ngspice DC sweep of the same parts', () => {
    const s = diodeString(defaultDiode, 2, 1000);
    const t = runSpice(
      `V1 a 0 DC 0\nD1 a b dm\nD2 b c dm\nR1 c 0 1000\n.model dm D (IS=${defaultDiode.is} N=${defaultDiode.n} RS=${defaultDiode.rs})`,
      'dc V1 0.2 5 0.05',
      ['i(v1)'],
    );
    const v = t['v-sweep'] as Float64Array;
    const i = t['i(v1)'] as Float64Array;
    for (let k = 0; k < v.length; k++) {
      const current = -(i[k] as number);
      const ours = stringCurrent(s, branchJunction(s, v[k] as number));
      // ngspice DC operating points: within 0.1 % or 1 nA (its GMIN of 1e-12 S per junction aside).
      expect(Math.abs(ours - current)).toBeLessThan(Math.max(1e-3 * current, 1e-9));
    }
  });

  test('the junction solve inverts the closed form V(I) for any drive, forward and reverse', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -50, max: 50, noNaN: true }),
        fc.integer({ min: 1, max: 4 }),
        fc.double({ min: 10, max: 1e6, noNaN: true }),
        (u, count, r) => {
          const s = diodeString(defaultDiode, count, r);
          const x = branchJunction(s, u);
          const current = stringCurrent(s, x);
          // Kirchhoff's voltage law round the branch: junctions + resistor = applied voltage.
          expect(x + s.r * current).toBeCloseTo(u, 9);
          if (current > 0) expect(stringVoltage(s, current)).toBeCloseTo(u, 9);
        },
      ),
      { numRuns: 300 },
    );
  });
});
