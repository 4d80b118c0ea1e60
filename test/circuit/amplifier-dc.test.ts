import { describe, expect, test } from 'vitest';
import { invertingAmpKind } from '../../src/circuit/inverting-amp.js';
import { noninvertingAmpKind } from '../../src/circuit/noninverting-amp.js';
import type { OpampModel, StageKind } from '../../src/circuit/types.js';
import { runSpice } from '../helpers/ngspice.js';
import { opampSubckt } from '../helpers/spice-opamp.js';

/*
 * The DC level at an amplifier's output (`<stage>.out.dc`) against an ngspice
 * DC operating point (Debian package `ngspice`): the behavioural op-amp of
 * test/helpers/spice-opamp.ts (DC gain 2e5, output held at ±10.5 V), its input
 * offset as a DC source in series with the + input and its bias current as two
 * current sources into the inputs, as data sheets define vos and ib. The stage
 * is fed a DC input (a waveform of frequency 0). Invented values.
 */

const rails = { pos: 12, neg: -12 };

function modelDc(kind: StageKind<unknown>, parts: Record<string, number>, vin: number, opamp: OpampModel): number {
  const out = kind.evaluate({ parts, settings: {}, opamp, supplies: rails, rails: {}, input: { frequency: 0, samples: new Float64Array(16).fill(vin) } });
  return out.values['out.dc'] as number;
}

function spiceDc(topology: 'inverting' | 'noninverting', parts: Record<string, number>, vin: number, vos: number, ib: number): number {
  const lines = [
    opampSubckt('oa', { gbw: 1e6, slew: 0.5e6, aol: 2e5, vhigh: rails.pos - 1.5, vlow: rails.neg + 1.5 }),
    `vin in 0 DC ${vin}`,
    // The offset in series with the + input; bias currents flowing into both inputs.
    `vos px pp DC ${vos}`,
    `ibp px 0 DC ${ib}`,
    `ibn nn 0 DC ${ib}`,
    'xa px nn out oa',
  ];
  if (topology === 'noninverting') lines.push('rsrc in pp 0.001', `rg nn 0 ${parts['Rg']}`, `rf out nn ${parts['Rf']}`);
  else lines.push('rgnd pp 0 0.001', `rin in nn ${parts['Rin']}`, `rf out nn ${parts['Rf']}`);
  const tab = runSpice(lines.join('\n'), `dc vin ${vin} ${vin} 1`, ['v(out)']);
  return (tab['v(out)'] as Float64Array)[0] as number;
}

const base: OpampModel = { gbw: 1e6, slew: 0.5e6, headroom: 1.5, maxSupply: 18, aol: 2e5 };

const cases = [
  {
    name: 'non-inverting ×2.5, 0.2 V in, +3 mV offset',
    kind: noninvertingAmpKind,
    topology: 'noninverting',
    parts: { Rg: 10e3, Rf: 15e3 },
    vin: 0.2,
    vos: 3e-3,
    ib: 0,
  },
  {
    name: 'non-inverting ×2.5, 0 V in, −5 mV offset, 250 nA bias through 15k',
    kind: noninvertingAmpKind,
    topology: 'noninverting',
    parts: { Rg: 10e3, Rf: 15e3 },
    vin: 0,
    vos: -5e-3,
    ib: 250e-9,
  },
  {
    name: 'inverting ×−3.3, 0.1 V in, +2 mV offset, 80 nA bias through 330k',
    kind: invertingAmpKind,
    topology: 'inverting',
    parts: { Rin: 100e3, Rf: 330e3 },
    vin: 0.1,
    vos: 2e-3,
    ib: 80e-9,
  },
  {
    name: 'stuck at the rail: ×2.5 of 5 V sits at the swing limit',
    kind: noninvertingAmpKind,
    topology: 'noninverting',
    parts: { Rg: 10e3, Rf: 15e3 },
    vin: 5,
    vos: 1e-3,
    ib: 0,
  },
] as const;

describe('amplifier DC level (vos × noise gain + ib × Rf) against an ngspice operating point', () => {
  for (const c of cases) {
    test(c.name, () => {
      const model = modelDc(c.kind as StageKind<unknown>, { ...c.parts }, c.vin, { ...base, vos: c.vos, ib: c.ib });
      const spice = spiceDc(c.topology, { ...c.parts }, c.vin, c.vos, c.ib);
      // ngspice operating point; 0.05 % + 50 µV (the sub-circuit's clamp diodes leave about a millivolt at the rail: 2 mV there).
      const allowed = c.vin === 5 ? 2e-3 : 5e-4 * Math.abs(spice) + 50e-6;
      expect(Math.abs(model - spice)).toBeLessThanOrEqual(allowed);
    });
  }

  test('without an offset or bias current the DC level is the input times the gain (old plans keep their targets)', () => {
    const dc = modelDc(noninvertingAmpKind as StageKind<unknown>, { Rg: 10e3, Rf: 15e3 }, 0.2, base);
    // Closed form: 0.2 V × 2.5 / (1 + 2.5/2e5), Sedra and Smith (finite open-loop gain).
    expect(dc).toBeCloseTo((0.2 * 2.5) / (1 + 2.5 / 2e5), 9);
  });

  test('the check is a meter reading whose help names the stuck-at-a-rail fault', () => {
    const spec = noninvertingAmpKind.checks({}).find((c) => c.key === 'out.dc');
    expect(spec?.instrument).toBe('meter');
    expect(spec?.captureFigure).toBe('mean');
    expect(spec?.how).toMatch(/stuck/);
    expect(spec?.how).toMatch(/rail/);
  });
});
