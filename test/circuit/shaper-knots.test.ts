import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { defaultDiode, diodeString, thermalVoltage } from '../../src/circuit/diode.js';
import type { ShaperNet } from '../../src/circuit/shaper-solver.js';
import { solveKnots } from '../../src/circuit/shaper-knots.js';
import { bisected, branch } from './fixtures/shaper-networks.js';

const network = fc.record({
  rs: fc.double({ min: 100, max: 100e3, noNaN: true }),
  rload: fc.option(fc.double({ min: 1e3, max: 1e6, noNaN: true }), { nil: undefined }),
  // A linear branch to a bias (a shorted diode): its conductance in gl, its current in il.
  linear: fc.option(fc.record({ r: fc.double({ min: 100, max: 1e5, noNaN: true }), bias: fc.double({ min: -3, max: 3, noNaN: true }) }), { nil: undefined }),
  kelvin: fc.double({ min: 250, max: 360, noNaN: true }),
  branches: fc.array(branch, { minLength: 1, maxLength: 6 }),
});

const span = fc.record({
  lo: fc.double({ min: -30, max: 1, noNaN: true }),
  width: fc.double({ min: 0.01, max: 40, noNaN: true }),
  k: fc.integer({ min: 3, max: 300 }),
});

describe('the shaper knots by explicit branch currents (Lambert W) against bisection', () => {
  test('every knot within 2 µV of the bisected node and its slope dv/dvin within 1e-3 of a finite difference', () => {
    fc.assert(
      fc.property(network, span, (n, s) => {
        const vt = thermalVoltage(n.kelvin);
        const gl = (n.rload === undefined ? 0 : 1 / n.rload) + (n.linear ? 1 / n.linear.r : 0);
        const net: ShaperNet = {
          gs: 1 / n.rs,
          gl,
          ...(n.linear ? { il: n.linear.bias / n.linear.r } : {}),
          branches: n.branches.map((b) => ({ sign: b.sign, bias: b.bias, diodes: diodeString(defaultDiode, b.count, b.r, vt) })),
        };
        const values = new Float64Array(s.k);
        const slopes = new Float64Array(s.k);
        const hi = s.lo + s.width;
        solveKnots(net, s.lo, hi, s.k, values, slopes, 3e-4, bisected);
        const h = s.width / (s.k - 1);
        for (let j = 0; j < s.k; j += Math.max(1, Math.floor(s.k / 9))) {
          const vin = j === s.k - 1 ? hi : s.lo + j * h;
          // Newton stops on a step under 0.3 mV, about 1 µV from the root (see shaper-solver.ts).
          expect(Math.abs((values[j] as number) - bisected(net, vin))).toBeLessThan(2e-6);
          // The implicit function's slope gs / (gs + gl + Σ dI/du), taken before the last step, against a central difference of the bisected node.
          const d = 1e-4;
          const slope = (bisected(net, vin + d) - bisected(net, vin - d)) / (2 * d);
          expect(Math.abs((slopes[j] as number) - slope)).toBeLessThan(1e-3);
        }
      }),
      { numRuns: 80 },
    );
  });
});
