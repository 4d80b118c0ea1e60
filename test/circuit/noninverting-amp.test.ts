import { describe, expect, test } from 'vitest';
import { noninvertingAmpKind } from '../../src/circuit/noninverting-amp.js';
import type { OpampModel, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';
import { corner, runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';

// Invented op-amp and supplies for the tests (not a particular part).
const opamp: OpampModel = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const supplies = { pos: 12, neg: -12 };
const sine = (peak: number, f: number): Waveform => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p));

function run(parts: Record<string, number>, input: Waveform, op: OpampModel = opamp) {
  return noninvertingAmpKind.evaluate({ parts, settings: {}, opamp: op, supplies, rails: {}, input });
}

function deck(op: OpampModel, rg: number, rf: number, source: string): string {
  return `${opampSubcktFor('opa', op, supplies)}\n${source}\nRg inn 0 ${rg}\nRf inn out ${rf}\nX1 in inn out opa`;
}

describe('noninverting-amp against ngspice AC (behavioural single-pole op-amp)', () => {
  test.each([
    { rg: 4.7e3, rf: 47e3, op: opamp },
    { rg: 10e3, rf: 15e3, op: { ...opamp, gbw: 4e6, aol: 5e4 } },
    { rg: 1e3, rf: 220e3, op: { ...opamp, aol: 2e3 } },
  ])('Rg $rg, Rf $rf, aol $op.aol: gain and −3 dB bandwidth', ({ rg, rf, op }) => {
    const t = runSpice(deck(op, rg, rf, 'Vin in 0 DC 0 AC 1'), 'ac dec 200 1 100meg', ['vm(out)', 'vp(out)']);
    const mag = t['vm(out)'] as Float64Array;
    const r = run({ Rg: rg, Rf: rf }, sine(0.01, 100), op);
    // ngspice AC at 1 Hz: gain within 0.1 %, in phase (not inverted).
    expect(Math.abs((r.values['gain'] as number) - (mag[0] as number)) / (mag[0] as number)).toBeLessThan(1e-3);
    expect(Math.abs((t['vp(out)'] as Float64Array)[0] as number)).toBeLessThan(0.01);
    // ngspice AC −3 dB point: within 1 % (the third case has a low aol, where the finite-gain terms matter).
    const bw = corner(t['frequency'] as Float64Array, mag);
    expect(Math.abs((r.values['bw'] as number) - bw) / bw).toBeLessThan(0.01);
  });

  test('finite open-loop gain lowers the gain below 1 + Rf/Rg (Sedra and Smith: G/(1 + G/aol))', () => {
    const r = run({ Rg: 1e3, Rf: 220e3 }, sine(0.01, 100), { ...opamp, aol: 2e3 });
    // Finite open-loop gain: G = G0/(1 + G0/Aol) with G0 = 1 + Rf/Rg = 221 and Aol 2000 (Sedra and Smith), hand arithmetic.
    expect(r.values['gain']).toBeCloseTo(221 / (1 + 221 / 2e3), 6);
  });

  test('a signal that would exceed the swing clips at rail − headroom', () => {
    const r = run({ Rg: 10e3, Rf: 47e3 }, sine(2.5, 1000));
    const out = r.outputs['out']?.samples as Float64Array;
    // The op-amp reaches 12 − 1.5 = 10.5 V on ±12 V rails.
    expect(Math.max(...out)).toBeCloseTo(10.5, 6);
    expect(Math.min(...out)).toBeCloseTo(-10.5, 6);
    expect(r.values['out.vpp']).toBeCloseTo(21, 6);
    expect(r.warnings.map((w) => w.message).join()).toMatch(/clips/);
  });
});

describe('noninverting-amp plan', () => {
  const parse = (json: Record<string, unknown>) => noninvertingAmpKind.parse({ json, path: 'stages[3]' }, 'x.plan.json');
  test.each([
    [{ parts: { Rf: '22k' } }, /stages\[3\]\.parts\.Rg: missing/],
    [{ parts: { Rg: '10k', Rf: '22 nF' } }, /stages\[3\]\.parts\.Rf: .*capacitance.*write e\.g\. "22k 1%"/],
    [{ parts: { Rg: 10000, Rf: '22k' } }, /stages\[3\]\.parts\.Rg: 10000 has no unit/],
  ])('%j', (json, message) => {
    expect(() => parse(json)).toThrow(StageParseError);
    expect(() => parse(json)).toThrow(message);
  });
  test('fault hints cover a missing Rg', () => {
    expect(noninvertingAmpKind.faultHints['gain']?.join(' ')).toMatch(/Rg open/);
  });
});
