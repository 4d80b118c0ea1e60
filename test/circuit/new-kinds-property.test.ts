import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { commonEmitterKind } from '../../src/circuit/common-emitter.js';
import { comparatorKind } from '../../src/circuit/comparator.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { regulatorKind } from '../../src/circuit/regulator.js';
import { timerAstableKind } from '../../src/circuit/timer-astable.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { zenerShuntKind } from '../../src/circuit/zener-shunt.js';

// Laws each model must keep over the whole plausible range of its parts: the
// tolerance engine samples corners no test case names. Physical laws stated
// beside each; no outside figure is needed for them.
const ohm = fc.double({ min: 100, max: 1e6, noNaN: true });
const base = { opamp: defaultOpamp, supplies: { pos: 15, neg: -15 } };

describe('laws of the new kinds over random parts', () => {
  test('regulator: never above the input less the dropout, and a larger R2 never lowers the output', () => {
    fc.assert(
      fc.property(ohm, ohm, ohm, fc.double({ min: 3, max: 40, noNaN: true }), (r1, r2, dr2, vin) => {
        const run = (R2: number) =>
          regulatorKind.evaluate({
            ...base,
            parts: { R1: r1, R2, vref: 1.25, iadj: 50e-6, dropout: 2 },
            settings: { from: 'V', polarity: '+', isFixed: false },
            rails: { V: vin },
          }).values['out.dc'] as number;
        expect(run(r2)).toBeLessThanOrEqual(vin - 2 + 1e-12);
        expect(run(r2 + dr2)).toBeGreaterThanOrEqual(run(r2) - 1e-12);
      }),
      { numRuns: 300 },
    );
  });

  test('zener-shunt: the output never exceeds the rail nor the open-circuit divider, and Iz ≥ 0', () => {
    fc.assert(
      fc.property(ohm, ohm, fc.double({ min: 2, max: 30, noNaN: true }), fc.double({ min: 0, max: 40, noNaN: true }), (rs, rl, vz, rail) => {
        const r = zenerShuntKind.evaluate({
          ...base,
          parts: { Rs: rs, Rload: rl, vz, rz: 5, izmin: 1e-3 },
          settings: { from: 'V', hasLoad: true },
          rails: { V: rail },
        });
        const v = r.values['out.dc'] as number;
        expect(v).toBeLessThanOrEqual((rail * rl) / (rs + rl) + 1e-9);
        expect(r.values['iz'] as number).toBeGreaterThanOrEqual(0);
        // Kirchhoff: the current through Rs is the zener's plus the load's.
        expect((rail - v) / rs - (r.values['iz'] as number) - v / rl).toBeCloseTo(0, 9);
      }),
      { numRuns: 300 },
    );
  });

  test('comparator: the lower threshold below the upper, duty within 0…1, output within the swing', () => {
    fc.assert(
      fc.property(ohm, ohm, fc.double({ min: -5, max: 5, noNaN: true }), fc.double({ min: 0.1, max: 12, noNaN: true }), (r1, r2, vref, peak) => {
        const r = comparatorKind.evaluate({
          ...base,
          parts: { R1: r1, R2: r2, vref },
          settings: { isPeriodic: true },
          rails: {},
          input: fromPhase(1e3, (p) => peak * Math.sin(2 * Math.PI * p)),
        });
        expect(r.values['vth.low'] as number).toBeLessThan(r.values['vth.high'] as number);
        expect(r.values['duty'] as number).toBeGreaterThanOrEqual(0);
        expect(r.values['duty'] as number).toBeLessThanOrEqual(1);
        for (const v of r.outputs['out']?.samples ?? []) expect(Math.abs(v)).toBeLessThanOrEqual(13.5 + 1e-9);
      }),
      { numRuns: 200 },
    );
  });

  test('common-emitter: the collector between ground and the rail, the emitter below the base, an inverting gain', () => {
    fc.assert(
      fc.property(
        ohm,
        ohm,
        fc.double({ min: 100, max: 47e3, noNaN: true }),
        fc.double({ min: 10, max: 10e3, noNaN: true }),
        fc.double({ min: 20, max: 600, noNaN: true }),
        (r1, r2, rc, re, hfe) => {
          const r = commonEmitterKind.evaluate({
            ...base,
            parts: { R1: r1, R2: r2, Rc: rc, Re: re, hfe, vbe: 0.65, vaf: 100 },
            settings: { from: 'V', hasCe: false },
            rails: { V: 12 },
            input: fromPhase(1e3, (p) => 0.01 * Math.sin(2 * Math.PI * p)),
          });
          const vc = r.values['vc.dc'] as number;
          expect(vc).toBeGreaterThanOrEqual(0);
          expect(vc).toBeLessThanOrEqual(12 + 1e-9);
          expect(r.values['ve.dc'] as number).toBeLessThanOrEqual((r.values['vb.dc'] as number) + 1e-9);
          expect(r.values['gain'] as number).toBeLessThanOrEqual(0);
          for (const v of Object.values(r.values)) expect(Number.isFinite(v)).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });

  test('timer-astable: duty above 1/2 and below 1, frequency below the ln 2 bound set by Ra + 2Rb', () => {
    fc.assert(
      fc.property(ohm, ohm, fc.double({ min: 1e-9, max: 1e-5, noNaN: true }), fc.double({ min: 5, max: 15, noNaN: true }), (ra, rb, c, rail) => {
        const r = timerAstableKind.evaluate({ ...base, parts: { Ra: ra, Rb: rb, C: c, vdrop: 1.7 }, settings: { from: 'V' }, rails: { V: rail } });
        expect(r.values['duty'] as number).toBeGreaterThan(0.5);
        expect(r.values['duty'] as number).toBeLessThan(1);
        expect(r.values['freq'] as number).toBeCloseTo(1 / (Math.LN2 * (ra + 2 * rb) * c), 6);
      }),
      { numRuns: 300 },
    );
  });
});
