import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { defaultDiode, diodeString } from '../../src/circuit/diode.js';
import { mirrorOrder } from '../../src/circuit/mirror.js';
import { type ShaperNet, solveNode } from '../../src/circuit/shaper-solver.js';
import { bisected, branch } from './fixtures/shaper-networks.js';

const network = fc.record({
  rs: fc.double({ min: 100, max: 100e3, noNaN: true }),
  rload: fc.option(fc.double({ min: 1e3, max: 1e6, noNaN: true }), { nil: undefined }),
  branches: fc.array(branch, { minLength: 1, maxLength: 6 }),
});

const drive = fc.record({
  shape: fc.constantFrom('triangle', 'sine', 'square'),
  peak: fc.double({ min: 0.01, max: 30, noNaN: true }),
  offset: fc.double({ min: -2, max: 2, noNaN: true }),
});

describe('shaper node solve on random networks and drives', () => {
  test('matches bisection to 2 µV and never returns NaN', () => {
    fc.assert(
      fc.property(network, drive, (n, d) => {
        const net: ShaperNet = {
          gs: 1 / n.rs,
          gl: n.rload === undefined ? 0 : 1 / n.rload,
          branches: n.branches.map((b) => ({ sign: b.sign, bias: b.bias, diodes: diodeString(defaultDiode, b.count, b.r) })),
        };
        const vin = new Float64Array(256);
        for (let i = 0; i < 256; i++) {
          const p = i / 256;
          const unit =
            d.shape === 'sine' ? Math.sin(2 * Math.PI * p) : d.shape === 'square' ? (p < 0.5 ? 1 : -1) : p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4;
          vin[i] = d.offset + d.peak * unit;
        }
        const plan = mirrorOrder(vin);
        const out = new Float64Array(256);
        solveNode(net, vin, plan.order, out);
        plan.fill(out);
        for (let i = 0; i < 256; i += 17) {
          expect(Number.isFinite(out[i])).toBe(true);
          expect(Math.abs((out[i] as number) - bisected(net, vin[i] as number))).toBeLessThan(2e-6);
        }
      }),
      { numRuns: 60, seed: 20261201 },
    );
  });
});
