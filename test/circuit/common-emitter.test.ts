import { describe, expect, test } from 'vitest';
import { commonEmitterKind, type CommonEmitterSettings } from '../../src/circuit/common-emitter.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';
import type { StageFault, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { runSpice } from '../helpers/ngspice.js';

interface Case {
  readonly rail: number;
  readonly r1: number;
  readonly r2: number;
  readonly rc: number;
  readonly re: number;
  readonly ce?: number;
  readonly hfe: number;
  readonly vaf: number;
}

function stage(c: Case, extra: Record<string, unknown> = {}) {
  const parts: Record<string, string> = { R1: `${c.r1}`, R2: `${c.r2}`, Rc: `${c.rc}`, Re: `${c.re}` };
  if (c.ce) parts['Ce'] = `${c.ce}`;
  return commonEmitterKind.parse({ json: { from: 'VCC', parts, hfe: c.hfe, vaf: `${c.vaf} V`, ...extra }, path: 'stages[4]' }, 'x.plan.json');
}

function run(c: Case, input: Waveform, fault?: StageFault) {
  const s = stage(c);
  const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
  return commonEmitterKind.evaluate({
    parts,
    settings: s.settings,
    opamp: defaultOpamp,
    supplies: { pos: 15, neg: -15 },
    rails: { VCC: c.rail },
    input,
    ...(fault ? { fault } : {}),
  });
}

const sine = (f: number, peak: number) => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p), 256);

/**
 * The stage in ngspice with a Gummel–Poon NPN: BF = hfe, VAF as the plan's,
 * IS chosen so that Vbe = 0.65 V at 1 mA at 27 °C (IS = 1 mA·e^(−0.65/Vt),
 * Vt = 25.865 mV), every other parameter at ngspice's default (no ohmic
 * resistances, no high injection). A stated idealised transistor, not any
 * type number's model. The signal comes through a 1 F coupling capacitor.
 */
function deck(c: Case, source: string): string {
  const is = 1e-3 * Math.exp(-0.65 / 0.025865);
  return [
    `Vcc vcc 0 DC ${c.rail}`,
    `R1 vcc b ${c.r1}`,
    `R2 b 0 ${c.r2}`,
    `Rc vcc c ${c.rc}`,
    `Re e 0 ${c.re}`,
    c.ce ? `Ce e 0 ${c.ce}` : '',
    `Vin in 0 ${source}`,
    `Cin in b 1`,
    `Q1 c b e qn`,
    `.model qn NPN (IS=${is} BF=${c.hfe} VAF=${c.vaf})`,
  ].join('\n');
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

const unbypassed: Case = { rail: 12, r1: 47e3, r2: 10e3, rc: 4.7e3, re: 1e3, hfe: 150, vaf: 100 };
const bypassed: Case = { ...unbypassed, ce: 100e-6 };
const lowBeta: Case = { rail: 9, r1: 33e3, r2: 6.8e3, rc: 2.2e3, re: 470, ce: 47e-6, hfe: 60, vaf: 40 };
const nearSaturation: Case = { rail: 12, r1: 33e3, r2: 10e3, rc: 3.3e3, re: 1.2e3, hfe: 200, vaf: 100 };

describe('common-emitter against ngspice (Gummel–Poon NPN stated above)', () => {
  test.each([
    ['unbypassed', unbypassed],
    ['bypassed', bypassed],
    ['low hfe, low Early voltage, 9 V', lowBeta],
    ['biased near saturation', nearSaturation],
  ] as const)('operating point: %s', (_name, c) => {
    const t = runSpice(deck(c, 'DC 0'), 'op', ['v(b)', 'v(e)', 'v(c)']);
    const vb = (t['v(b)'] as Float64Array)[0] as number;
    const ve = (t['v(e)'] as Float64Array)[0] as number;
    const vc = (t['v(c)'] as Float64Array)[0] as number;
    const r = run(c, sine(1e3, 1e-3));
    // ngspice operating point: DC levels within 2 % (the tolerance).
    expect(rel(r.values['vb.dc'] as number, vb)).toBeLessThan(0.02);
    expect(rel(r.values['ve.dc'] as number, ve)).toBeLessThan(0.02);
    expect(rel(r.values['vc.dc'] as number, vc)).toBeLessThan(0.02);
    expect(rel(r.values['ic'] as number, (c.rail - vc) / c.rc)).toBeLessThan(0.02);
  });

  test.each([
    ['unbypassed, 1 kHz', unbypassed, 1e3],
    ['bypassed, 1 kHz', bypassed, 1e3],
    ['bypassed, 20 Hz (Ce only partly bypasses)', bypassed, 20],
    ['low hfe, low Early voltage, 1 kHz', lowBeta, 1e3],
  ] as const)('gain: %s', (_name, c, f) => {
    const t = runSpice(deck(c, 'DC 0 AC 1'), `ac lin 1 ${f} ${f}`, ['vm(c)']);
    const spice = (t['vm(c)'] as Float64Array)[0] as number;
    const r = run(c, sine(f, 1e-3));
    // ngspice AC analysis at the signal frequency: the transistor gain within 5 % (the tolerance).
    expect(rel(-(r.values['gain'] as number), spice)).toBeLessThan(0.05);
    expect(r.values['gain'] as number).toBeLessThan(0);
  });

  test.each([
    ['small signal, unbypassed: no clipping', unbypassed, 0.3, false],
    ['bypassed, 8 mV at the base (0.3·Vt: the exponential law moves vpp under 1 %)', bypassed, 8e-3, false],
    ['bypassed, 4 mV at the base', bypassed, 4e-3, false],
    ['near saturation: 1.2 V at the base drives the collector into the emitter', nearSaturation, 1.2, true],
  ] as const)('output vpp: %s', (_name, c, peak, clips) => {
    const f = 1e3;
    const t = runSpice(deck(c, `SIN(0 ${peak} ${f})`), `tran ${1 / f / 1000} ${6 / f} ${4 / f} ${1 / f / 1000}`, ['v(c)']);
    const v = t['v(c)'] as Float64Array;
    const spiceVpp = Math.max(...v) - Math.min(...v);
    const r = run(c, sine(f, peak));
    // ngspice transient, periods 5–6: within 5 % (the transistor-gain tolerance).
    expect(rel(r.values['out.vpp'] as number, spiceVpp)).toBeLessThan(0.05);
    expect(r.warnings.some((w) => /saturates/.test(w.message))).toBe(clips);
  });
});

describe('common-emitter faults against ngspice (the same transistor)', () => {
  test.each([
    ['R2 open: saturated', { role: 'R2', mode: 'open' }, { ...unbypassed, r2: 1e12 }],
    ['R1 open: cut off', { role: 'R1', mode: 'open' }, { ...unbypassed, r1: 1e12 }],
    ['Re shorted: saturated hard', { role: 'Re', mode: 'short' }, { ...unbypassed, re: 0.1 }],
    ['Rc open: the collector follows the emitter', { role: 'Rc', mode: 'open' }, { ...unbypassed, rc: 1e12 }],
    ['Rc shorted: the collector at the rail', { role: 'Rc', mode: 'short' }, { ...unbypassed, rc: 0.1 }],
    ['Ce shorted on the bypassed stage: as Re shorted', { role: 'Ce', mode: 'short' }, { ...unbypassed, re: 0.1 }],
  ] as const)('%s', (_name, fault, faulted) => {
    const t = runSpice(deck(faulted, 'DC 0'), 'op', ['v(b)', 'v(e)', 'v(c)']);
    const r = run(_name.startsWith('Ce') ? bypassed : unbypassed, sine(1e3, 1e-3), fault);
    // ngspice operating point with the part opened (1 TΩ) or shorted (0.1 Ω): each DC level within 2 % or 50 mV
    // (saturation: Vce(sat) from the forced β by the Ebers–Moll form, ngspice from its Gummel–Poon equations).
    for (const [key, node] of [
      ['vb.dc', 'v(b)'],
      ['ve.dc', 'v(e)'],
      ['vc.dc', 'v(c)'],
    ] as const) {
      const spice = (t[node] as Float64Array)[0] as number;
      expect(Math.abs((r.values[key] as number) - spice)).toBeLessThan(Math.max(0.05, 0.02 * Math.abs(spice)));
    }
  });
});

describe('common-emitter closed form (Sedra and Smith, the classical bias and the CE amplifier with Re)', () => {
  test('with hfe and VA large and Vbe at its 1 mA value (a 1 mA stage): Ic = hfe·(Vth − Vbe)/(Rth + (hfe + 1)·Re), gain −Rc/(re + Re)', () => {
    // Built so that Ic ≈ 1 mA (Vbe exactly its 1 mA value): Vth − 0.65 ≈ 1.0 V.
    const c: Case = { rail: 12, r1: 62e3, r2: 10e3, rc: 4.7e3, re: 1e3, hfe: 2000, vaf: 1000 };
    const r = run(c, sine(1e3, 1e-3));
    const vth = (12 * 10) / 72;
    const rth = (62e3 * 10e3) / 72e3;
    const ic = (c.hfe * (vth - 0.65)) / (rth + (c.hfe + 1) * c.re);
    // Vbe slides by Vt·ln(Ic/1 mA) in the model and the 1000 V Early voltage adds (1 + Vcb/VA): within 1 % of the hand form near 1 mA.
    expect(rel(r.values['ic'] as number, ic)).toBeLessThan(0.01);
    const re = 0.025865 / ic;
    expect(rel(r.values['gain'] as number, -c.rc / (re + c.re))).toBeLessThan(0.01);
  });
});

describe('common-emitter faults, impedances and plan', () => {
  test('an open bypass capacitor drops the gain to the unbypassed value; R1 open cuts the stage off', () => {
    const g = run(bypassed, sine(1e3, 1e-3), { role: 'Ce', mode: 'open' }).values['gain'] as number;
    expect(rel(g, run(unbypassed, sine(1e3, 1e-3)).values['gain'] as number)).toBeLessThan(1e-9);
    const off = run(unbypassed, sine(1e3, 1e-3), { role: 'R1', mode: 'open' });
    expect(off.values['ic']).toBe(0);
    expect(off.values['vc.dc']).toBe(12);
    expect(off.warnings.map((w) => w.message).join('\n')).toMatch(/cut off/);
    const sat = run(unbypassed, sine(1e3, 1e-3), { role: 'R2', mode: 'open' });
    expect(sat.warnings.map((w) => w.message).join('\n')).toMatch(/saturated at its operating point/);
    expect(commonEmitterKind.faults?.(stage(bypassed).settings as CommonEmitterSettings).map((f) => f.role)).toEqual(['R1', 'R2', 'Rc', 'Re', 'Q', 'Ce']);
  });

  test('input impedance R1 ∥ R2 ∥ (hfe + 1)(re + Re) and output impedance about Rc ∥ ro(1 + gm·Re), against an ngspice AC analysis', () => {
    const s = stage(unbypassed);
    const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
    const x = { parts, settings: s.settings as CommonEmitterSettings, opamp: defaultOpamp, rails: { VCC: 12 } };
    const zin = commonEmitterKind.inputImpedance?.(x, 1e3);
    const zout = commonEmitterKind.outputImpedance?.(x, 'out', 1e3);
    // ngspice: 1 A AC into the base through the coupling capacitor (input) and into the collector with the input grounded (output).
    const tin = runSpice(
      `${deck(unbypassed, 'DC 0')}\nIt 0 b DC 0 AC 1`.replace('Vin in 0 DC 0', 'Vin in 0 DC 0\nRopen in 0 1e12').replace('Cin in b 1', 'Cin in b 1p'),
      'ac lin 1 1000 1000',
      ['vm(b)'],
    );
    const tout = runSpice(`${deck(unbypassed, 'DC 0')}\nIt 0 c DC 0 AC 1`, 'ac lin 1 1000 1000', ['vm(c)']);
    expect(rel(Math.hypot(zin?.re ?? 0, zin?.im ?? 0), (tin['vm(b)'] as Float64Array)[0] as number)).toBeLessThan(0.02);
    expect(rel(Math.hypot(zout?.re ?? 0, zout?.im ?? 0), (tout['vm(c)'] as Float64Array)[0] as number)).toBeLessThan(0.02);
  });

  test('without the rails (a caller that passes none) the input impedance of a bypassed stage still counts rπ: within 25 % of ngspice', () => {
    const s = stage(bypassed);
    const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
    const zin = commonEmitterKind.inputImpedance?.({ parts, settings: s.settings as CommonEmitterSettings, opamp: defaultOpamp }, 1e3);
    const t = runSpice(
      `${deck(bypassed, 'DC 0')}\nIt 0 b DC 0 AC 1`.replace('Vin in 0 DC 0', 'Vin in 0 DC 0\nRopen in 0 1e12').replace('Cin in b 1', 'Cin in b 1p'),
      'ac lin 1 1000 1000',
      ['vm(b)'],
    );
    // ngspice AC: 2.24 kΩ; the fallback takes rπ at 1 mA instead of the 1.37 mA operating point.
    expect(rel(Math.hypot(zin?.re ?? 0, zin?.im ?? 0), (t['vm(b)'] as Float64Array)[0] as number)).toBeLessThan(0.25);
  });

  test.each([
    [{ from: 'VCC', parts: { R1: '47k', R2: '10k', Rc: '4k7' } }, /stages\[4\]\.parts\.Re: missing/],
    [{ from: 'VCC', parts: { R1: '47k', R2: '10k', Rc: '4k7', Re: '1k' }, hfe: 1 }, /stages\[4\]\.hfe: "1" reads as 1 V\/V, not a plausible value/],
    [{ from: 'VCC', parts: { R1: '47k', R2: '10k', Rc: '4k7', Re: '1k', Ce: '100 V' } }, /stages\[4\]\.parts\.Ce: .*capacitance/],
  ])('plan error %j', (json, message) => {
    const parse = () => commonEmitterKind.parse({ json, path: 'stages[4]' }, 'x.plan.json');
    expect(parse).toThrow(StageParseError);
    expect(parse).toThrow(message);
  });
});
