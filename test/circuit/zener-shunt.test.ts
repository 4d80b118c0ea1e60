import { describe, expect, test } from 'vitest';
import { zenerShuntKind, type ZenerShuntSettings } from '../../src/circuit/zener-shunt.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';
import type { Complex, StageFault } from '../../src/circuit/types.js';
import { runSpice } from '../helpers/ngspice.js';

function stage(json: Record<string, unknown>) {
  return zenerShuntKind.parse({ json, path: 'stages[1]' }, 'x.plan.json');
}

function run(json: Record<string, unknown>, rail: number, extra: { fault?: StageFault; load?: (o: string, f: number) => Complex | undefined } = {}) {
  const s = stage({ from: 'R', ...json });
  const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
  return zenerShuntKind.evaluate({ parts, settings: s.settings, opamp: defaultOpamp, supplies: { pos: 15, neg: -15 }, rails: { R: rail }, ...extra });
}

/**
 * The zener in ngspice: the standard junction diode's reverse breakdown,
 * BV = vz, IBV = 10 µA, NBV = 0.1 (a sharp knee, 2.6 mV per e-fold of
 * current), RS = rz; forward IS = 1e-14 A, N = 1. A stated idealised part,
 * not any type number's model. On a negative rail the zener is turned round.
 * Fitted the wrong way round it conducts forward: the same junction with a
 * 0.5 Ω bulk resistance instead of rz (RS in ngspice acts both ways).
 */
function spiceZener(o: { rail: number; rs: number; vz: number; rz: number; rload?: number; reversed?: boolean }): { v: number; iz: number } {
  const negative = o.rail < 0;
  // Cathode at the output (anode at the output on a negative rail, or when fitted reversed).
  const flip = negative !== Boolean(o.reversed);
  const deck = [
    `Vr rail 0 DC ${o.rail}`,
    `Rs rail out ${o.rs}`,
    flip ? `Dz out 0 dz` : `Dz 0 out dz`,
    o.rload ? `Rl out 0 ${o.rload}` : '',
    o.reversed ? `.model dz D (IS=1e-14 N=1 RS=0.5)` : `.model dz D (IS=1e-14 N=1 BV=${o.vz} IBV=1e-5 NBV=0.1 RS=${o.rz})`,
  ].join('\n');
  const t = runSpice(deck, 'op', ['v(out)', 'i(vr)']);
  const v = (t['v(out)'] as Float64Array)[0] as number;
  const is = Math.abs((t['i(vr)'] as Float64Array)[0] as number);
  return { v, iz: is - Math.abs(v) / (o.rload ?? Infinity) };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('zener-shunt against ngspice (breakdown diode stated above)', () => {
  test.each([
    // [case, rail, Rs, Rload, vz, rz]
    ['5.1 V from 12 V through 680 Ω, light load', 12, 680, 10e3, 5.1, 5],
    ['a 15 V zener carrying 30 mA', 24, 270, undefined, 15, 10],
    ['near dropout: Iz about 0.9 mA under a 680 Ω load', 12, 820, 680, 5.1, 5],
    ['dropped out under a 470 Ω load: the zener is off', 12, 820, 470, 5.1, 5],
    ['on a negative rail: −6.2 V from −15 V', -15, 1e3, 4.7e3, 6.2, 8],
  ] as const)('%s', (_name, rail, rs, rload, vz, rz) => {
    const json = { parts: rload ? { Rs: `${rs}`, Rload: `${rload}` } : { Rs: `${rs}` }, vz: `${vz} V`, rz: `${rz} ohm` };
    const got = run(json, rail);
    const spice = spiceZener({ rail, rs, vz, rz, ...(rload ? { rload } : {}) });
    // ngspice operating point: the output within 2 % (the DC tolerance).
    expect(rel(got.values['out.dc'] as number, spice.v)).toBeLessThan(0.02);
    // Zener current (rail current less the load's): within 5 % of the rail current, or 20 µA when it is off.
    expect(Math.abs((got.values['iz'] as number) - spice.iz)).toBeLessThan(Math.max(2e-5, 0.05 * spice.iz));
  });

  test('a load from the next stage (EvalInput.load) acts as Rload does', () => {
    const viaLoad = run({ parts: { Rs: '820' }, vz: '5.1 V' }, 12, { load: (o) => (o === 'out' ? { re: 680, im: 0 } : undefined) });
    const spice = spiceZener({ rail: 12, rs: 820, vz: 5.1, rz: 5, rload: 680 });
    // ngspice operating point within 2 %.
    expect(rel(viaLoad.values['out.dc'] as number, spice.v)).toBeLessThan(0.02);
    expect(viaLoad.warnings.map((w) => w.message).join('\n')).toMatch(/below its 1 mA minimum/);
  });

  test('a zener fitted the wrong way round reads a forward drop (ngspice with the same junction, within 10 mV)', () => {
    const got = run({ parts: { Rs: '680' }, vz: '5.1 V' }, 12, { fault: { role: 'Z', mode: 'reversed' } });
    const spice = spiceZener({ rail: 12, rs: 680, vz: 5.1, rz: 5, reversed: true });
    expect(Math.abs((got.values['out.dc'] as number) - spice.v)).toBeLessThan(0.01);
    // The current through it (forward now), as the drops across Rs show it: within 1 %.
    expect(Math.abs((got.values['iz'] as number) - spice.iz) / spice.iz).toBeLessThan(0.01);
  });
});

describe('zener-shunt closed form (Sedra & Smith, the zener shunt-regulator example; values from memory)', () => {
  // 6.8 V zener specified at 5 mA with rz = 20 Ω, so VZ0 = 6.8 − 0.005·20 = 6.7 V; 10 V supply, R = 0.5 kΩ.
  const json = { parts: { Rs: '500' }, vz: '6.7 V', rz: '20 ohm', izmin: '0.2 mA' };
  test('no load: VO = 6.7 + 20·(10 − 6.7)/520 = 6.827 V', () => {
    const r = run(json, 10);
    expect(r.values['out.dc']).toBeCloseTo(6.7 + (20 * 3.3) / 520, 9);
    expect(r.values['out.dc']).toBeCloseTo(6.827, 3);
    expect(r.warnings).toEqual([]);
  });
  test('a 0.5 kΩ load turns the zener off: VO = 10·0.5/(0.5 + 0.5) = 5 V, with a dropout warning', () => {
    const r = run({ ...json, parts: { Rs: '500', Rload: '500' } }, 10);
    expect(r.values['out.dc']).toBeCloseTo(5, 9);
    expect(r.values['iz']).toBe(0);
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/does not conduct.*dropped out of regulation/);
  });
  test('a 1 mA load lowers VO by rz·IL·Rs/(Rs + rz) (line regulation by hand: about 19.2 mV)', () => {
    const free = run(json, 10).values['out.dc'] as number;
    const loaded = run({ ...json, parts: { Rs: '500', Rload: '6.81k' } }, 10).values['out.dc'] as number;
    expect(free - loaded).toBeGreaterThan(0.018);
    expect(free - loaded).toBeLessThan(0.0205);
  });
});

describe('zener-shunt faults, impedance and plan', () => {
  const json = { parts: { Rs: '680', Rload: '10k' }, vz: '5.1 V' };
  test('open zener reads the divider, shorted zener or open Rs reads 0 V, shorted Rs warns of heat', () => {
    expect(run(json, 12, { fault: { role: 'Z', mode: 'open' } }).values['out.dc']).toBeCloseTo((12 * 10e3) / 10.68e3, 9);
    expect(run(json, 12, { fault: { role: 'Z', mode: 'short' } }).values['out.dc']).toBe(0);
    expect(run(json, 12, { fault: { role: 'Rs', mode: 'open' } }).values['out.dc']).toBe(0);
    const hot = run(json, 12, { fault: { role: 'Rs', mode: 'short' } });
    expect(hot.warnings.map((w) => w.message).join('\n')).toMatch(/runs hot/);
    expect(zenerShuntKind.faults?.(stage({ from: 'R', ...json }).settings as ZenerShuntSettings).map((f) => `${f.role}:${f.modes.join('/')}`)).toEqual([
      'Z:open/short/reversed',
      'Rs:open/short',
      'Rload:open/short',
    ]);
  });

  test('output impedance rz ∥ Rs ∥ Rload in regulation, Rs ∥ Rload out of it', () => {
    const s = stage({ from: 'R', ...json });
    const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
    const z = zenerShuntKind.outputImpedance?.({ parts, settings: s.settings as ZenerShuntSettings, opamp: defaultOpamp, rails: { R: 12 } }, 'out', 0);
    expect(z?.re).toBeCloseTo(1 / (1 / 5 + 1 / 680 + 1 / 10e3), 9);
    const off = zenerShuntKind.outputImpedance?.({ parts, settings: s.settings as ZenerShuntSettings, opamp: defaultOpamp, rails: { R: 5 } }, 'out', 0);
    expect(off?.re).toBeCloseTo(1 / (1 / 680 + 1 / 10e3), 9);
  });

  test.each([
    [{ from: 'R', parts: { Rs: '680' } }, /stages\[1\]\.vz: missing; write a voltage, e\.g\. "5\.1 V 5%"/],
    [{ from: 'R', parts: { Rs: '680' }, vz: '0.5 V' }, /stages\[1\]\.vz: "0\.5 V" reads as 500 mV, not a plausible value/],
    [{ parts: { Rs: '680' }, vz: '5.1 V' }, /stages\[1\]\.from: missing/],
    [{ from: 'R', parts: { Rs: '680', Rz: '5' }, vz: '5.1 V' }, /stages\[1\]\.parts\.Rz: is not a key here/],
    [{ from: 'R', parts: { Rs: '680' }, vz: '5.1 V', rz: '-3 ohm' }, /stages\[1\]\.rz: "-3 ohm" must be above zero/],
  ])('%j', (j, message) => {
    expect(() => stage(j)).toThrow(StageParseError);
    expect(() => stage(j)).toThrow(message);
  });
});
