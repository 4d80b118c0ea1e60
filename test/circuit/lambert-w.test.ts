import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { lambertW0Log } from 'lambert-w-function';
import { lambertFromTable, lambertTable, lambertWOfExp, tableFirst, tableLast } from '../../src/circuit/lambert-w.js';
import { defaultDiode, diodeString, stringVoltage } from '../../src/circuit/diode.js';

const table = lambertTable();

describe("Lambert's W of e^L, the table the shaper's trials read", () => {
  test('the Newton reference against the lambert-w-function package (W0 of a logarithmic argument)', () => {
    // lambert-w-function 5.0.0 (npm), lambertW0Log: W0(e^L) by Iacono and Boyd's iteration,
    // good to rounding where e^L does not underflow. Ours to 1e-13 relative there.
    for (let L = -30; L <= 200; L += 0.173) {
      const w = lambertWOfExp(L);
      expect(Math.abs(w - lambertW0Log(L)) / w).toBeLessThan(1e-13);
    }
  });

  test('the table against the package: 1e-6 relative where w ≈ e^L, 1e-8 where w > 1', () => {
    // The tolerances are the interpolation error of cubic Hermite at 8 intervals per unit (h⁴/384 of e^L, about 6e-7).
    fc.assert(
      fc.property(fc.double({ min: -30, max: 120, noNaN: true }), (L) => {
        const w = lambertFromTable(table, L);
        const reference = lambertW0Log(L);
        expect(Math.abs(w - reference) / reference).toBeLessThan(reference > 1 ? 1e-8 : 1e-6);
      }),
      { numRuns: 2000 },
    );
  });

  test('the table edges: continuous into the Newton steps above it, 0 far below', () => {
    const below = lambertFromTable(table, tableLast - 1e-9);
    const above = lambertFromTable(table, tableLast + 1e-9);
    expect(Math.abs(above - below) / above).toBeLessThan(1e-9);
    expect(lambertFromTable(table, tableFirst - 1)).toBe(0);
    // e^−40 ≈ 4e-18: what is dropped below the table is below any current the solver resolves.
    expect(lambertFromTable(table, tableFirst)).toBeLessThan(5e-18);
  });

  test('a diode string and its resistor: the explicit current gives back the voltage across them (Shockley law with RS)', () => {
    // I = (N·Vt/R)·W(p·e^(p + u/(N·Vt))) − IS, p = R·IS/(N·Vt); checked through the closed form
    // V(I) = N·Vt·ln(1 + I/IS) + I·R of diode.ts (two 1N4148 models and 2k2), to 10 µV.
    const s = diodeString(defaultDiode, 2, 2200);
    const p = (s.r * s.is) / s.nvt;
    for (let u = -2; u <= 8; u += 0.01) {
      const w = lambertFromTable(table, Math.log(p) + p + u / s.nvt);
      const current = (s.nvt / s.r) * w - s.is;
      if (current <= -s.is * (1 - 1e-9)) continue; // far off: only −IS flows, the voltage is not recoverable from it
      expect(Math.abs(stringVoltage(s, current) - u)).toBeLessThan(1e-5);
    }
  });
});
