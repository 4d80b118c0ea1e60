import { describe, expect, test } from 'vitest';
import { comparatorKind, type ComparatorSettings } from '../../src/circuit/comparator.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';
import type { OpampModel, StageFault, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';

const supplies = { pos: 12, neg: -12 };

function stage(json: Record<string, unknown>) {
  return comparatorKind.parse({ json, path: 'stages[3]' }, 'x.plan.json');
}

function run(json: Record<string, unknown>, input: Waveform, opamp: OpampModel = defaultOpamp, fault?: StageFault) {
  const s = stage(json);
  const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
  return comparatorKind.evaluate({ parts, settings: s.settings, opamp, supplies, rails: {}, input, ...(fault ? { fault } : {}) });
}

const sine = (f: number, peak: number) => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p), 4096);

/** The comparator in ngspice: the behavioural op-amp of test/helpers/spice-opamp.ts, R1 from the reference, R2 from the output. */
function deck(o: { r1: number; r2: number; vref: number; source: string; opamp: OpampModel }): string {
  return [
    opampSubcktFor('oa', o.opamp, supplies),
    `Vin in 0 ${o.source}`,
    `Vr ref 0 DC ${o.vref}`,
    `R1 ref p ${o.r1}`,
    `R2 out p ${o.r2}`,
    'Xc p in out oa',
  ].join('\n');
}

/** Output frequency, duty (time above the mid level) and peak-to-peak over the whole periods of a transient. */
function measure(t: Float64Array, v: Float64Array): { freq: number; duty: number; vpp: number } {
  const hi = Math.max(...v);
  const lo = Math.min(...v);
  const mid = (hi + lo) / 2;
  const rises: number[] = [];
  const falls: number[] = [];
  for (let i = 1; i < v.length; i++) {
    const a = (v[i - 1] as number) - mid;
    const b = (v[i] as number) - mid;
    if (a < 0 !== b < 0) {
      const at = (t[i - 1] as number) + ((t[i] as number) - (t[i - 1] as number)) * (a / (a - b));
      (b > 0 ? rises : falls).push(at);
    }
  }
  const r0 = rises[0] as number;
  const r1 = rises[rises.length - 1] as number;
  const periods = rises.length - 1;
  const period = (r1 - r0) / periods;
  const fall = falls.find((x) => x > r0) as number;
  return { freq: 1 / period, duty: (fall - r0) / period, vpp: hi - lo };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('comparator against ngspice (behavioural op-amp, test/helpers/spice-opamp.ts)', () => {
  test.each([
    ['symmetric, reference at 0 V', 10e3, 100e3, 0],
    ['with a 2 V reference (thresholds off centre)', 10e3, 47e3, 2],
    ['wide hysteresis', 22e3, 22e3, -1],
  ] as const)('thresholds from a slow triangle: %s', (_name, r1, r2, vref) => {
    const f = 20;
    const T = 1 / f;
    const t = runSpice(
      deck({ r1, r2, vref, opamp: defaultOpamp, source: `PWL(0 0 ${T / 4} 9 ${(3 * T) / 4} -9 ${T} 0) r=0` }),
      `tran ${T / 20000} ${2 * T} ${T} ${T / 20000}`,
      ['v(out)', 'v(in)'],
    );
    const time = t['time'] as Float64Array;
    const out = t['v(out)'] as Float64Array;
    const vin = t['v(in)'] as Float64Array;
    const hi = Math.max(...out);
    const lo = Math.min(...out);
    // The input where the output has left its level by 2 % of the swing (the switching instant).
    const at = (fromHigh: boolean) => {
      for (let i = 1; i < out.length; i++) {
        const was = out[i - 1] as number;
        const is = out[i] as number;
        if (fromHigh ? was > hi - 0.02 * (hi - lo) && is <= hi - 0.02 * (hi - lo) : was < lo + 0.02 * (hi - lo) && is >= lo + 0.02 * (hi - lo))
          return vin[i] as number;
      }
      return Number.NaN;
    };
    void time;
    const r = run({ parts: { R1: `${r1}`, R2: `${r2}` }, vref: `${vref} V` }, sine(1e3, 9));
    // ngspice: thresholds within 2 % of their value or 10 mV (DC levels, the tolerance).
    const tol = (x: number) => Math.max(0.01, 0.02 * Math.abs(x));
    expect(Math.abs((r.values['vth.high'] as number) - at(true))).toBeLessThan(tol(at(true)));
    expect(Math.abs((r.values['vth.low'] as number) - at(false))).toBeLessThan(tol(at(false)));
  });

  test.each([
    ['1 kHz sine, symmetric', 1e3, 3, 10e3, 100e3, 0, defaultOpamp],
    ['1 kHz sine, 2 V reference: duty off 50 %', 1e3, 4, 10e3, 47e3, 2, defaultOpamp],
    ['10 kHz sine on a 0.5 V/µs op-amp: each 21 V edge takes 42 % of the period', 10e3, 5, 10e3, 100e3, 0, defaultOpamp],
    ['10 kHz sine on a fast op-amp (10 MHz, 20 V/µs)', 10e3, 2, 4.7e3, 47e3, 0.5, { ...defaultOpamp, gbw: 10e6, slew: 20e6 }],
  ] as const)('frequency, duty and vpp: %s', (_name, f, peak, r1, r2, vref, opamp) => {
    const T = 1 / f;
    const t = runSpice(deck({ r1, r2, vref, opamp, source: `SIN(0 ${peak} ${f})` }), `tran ${T / 4000} ${14 * T} ${4 * T} ${T / 4000}`, ['v(out)']);
    const s = measure(t['time'] as Float64Array, t['v(out)'] as Float64Array);
    const r = run({ parts: { R1: `${r1}`, R2: `${r2}` }, vref: `${vref} V` }, sine(f, peak), opamp);
    // ngspice transient, ten whole periods: frequency within 1 %, duty within 0.01 (absolute), vpp within 2 % (DC-level tolerance).
    expect(rel(r.values['freq'] as number, s.freq)).toBeLessThan(0.01);
    expect(Math.abs((r.values['duty'] as number) - s.duty)).toBeLessThan(0.01);
    expect(rel(r.values['out.vpp'] as number, s.vpp)).toBeLessThan(0.02);
  });
});

describe('comparator whose edges cannot finish (40 kHz on a 0.5 V/µs op-amp)', () => {
  test('the output is a triangle of about SR·T/2 with a warning; ngspice agrees on its size within 2 %', () => {
    const f = 40e3;
    const T = 1 / f;
    const t = runSpice(
      deck({ r1: 10e3, r2: 100e3, vref: 0, opamp: defaultOpamp, source: `SIN(0 5 ${f})` }),
      `tran ${T / 2000} ${40 * T} ${30 * T} ${T / 2000}`,
      ['v(out)'],
    );
    const v = t['v(out)'] as Float64Array;
    const spiceVpp = Math.max(...v) - Math.min(...v);
    const r = run({ parts: { R1: '10k', R2: '100k' } }, sine(f, 5));
    // The slew limit bounds it by hand: 0.5 V/µs × 12.5 µs = 6.25 V.
    expect(r.values['out.vpp'] as number).toBeLessThanOrEqual(6.25 + 1e-9);
    // ngspice, periods 30–40: within 2 %. With fixed thresholds (the ideal form) the model said 6.25 V against ngspice's 5.65 V;
    // the (+) input following the unfinished edge closes that gap.
    expect(rel(r.values['out.vpp'] as number, spiceVpp)).toBeLessThan(0.02);
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/never reaches its levels/);
  });
});

describe('comparator closed form and behaviour', () => {
  test('Sedra and Smith, inverting bistable with a reference: ±10.5 V swing, R1 = 10k, R2 = 100k gives ±0.9545 V, hysteresis 1.909 V (by hand)', () => {
    const r = run({ parts: { R1: '10k', R2: '100k' } }, sine(1e3, 3));
    expect(r.values['vth.high']).toBeCloseTo((10.5 * 10) / 110, 9);
    expect(r.values['vth.low']).toBeCloseTo((-10.5 * 10) / 110, 9);
    expect(r.values['hysteresis']).toBeCloseTo((21 * 10) / 110, 9);
    // A symmetric sine through symmetric thresholds: 50 % duty, the input's frequency, the full swing.
    expect(r.values['duty']).toBeCloseTo(0.5, 3);
    expect(r.values['freq']).toBe(1e3);
    expect(r.values['out.vpp']).toBeCloseTo(21, 6);
  });

  test('an input too small to cross the thresholds leaves the output still, with a warning', () => {
    const r = run({ parts: { R1: '10k', R2: '100k' } }, sine(1e3, 0.5));
    expect(r.values['freq']).toBe(0);
    expect(r.values['out.vpp']).toBe(0);
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/never switches/);
  });

  test('a DC input: no frequency or duty unless "periodic": false drops them', () => {
    const level: Waveform = { frequency: 0, samples: new Float64Array([2]) };
    const r = run({ parts: { R1: '10k', R2: '100k' } }, level);
    expect(r.outputs['out']?.samples[0]).toBeCloseTo(-10.5, 9);
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/"periodic": false/);
    const quiet = run({ parts: { R1: '10k', R2: '100k' }, periodic: false }, level);
    expect(Object.keys(quiet.values).sort()).toEqual(['hysteresis', 'out.vpp', 'vth.high', 'vth.low']);
    expect(comparatorKind.checks(stage({ parts: { R1: '1k', R2: '1k' }, periodic: false }).settings as ComparatorSettings).map((c) => c.key)).not.toContain(
      'freq',
    );
  });

  test('a 200 Ω load current-limits the output at about 25 mA × 200 Ω = ±5 V (common practice, no source), and the thresholds follow', () => {
    const s = stage({ parts: { R1: '10k', R2: '100k' } });
    const parts = Object.fromEntries(Object.entries(s.parts).map(([k, v]) => [k, v.nominal]));
    const r = comparatorKind.evaluate({
      parts,
      settings: s.settings,
      opamp: defaultOpamp,
      supplies,
      rails: {},
      input: sine(1e3, 3),
      load: (o) => (o === 'out' ? { re: 200, im: 0 } : undefined),
    });
    expect(r.values['out.vpp']).toBeCloseTo(10, 6);
    expect(r.values['vth.high']).toBeCloseTo((5 * 10) / 110, 9);
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/current-limits/);
  });

  test('faults: R2 open leaves no hysteresis, R1 open makes it the whole swing', () => {
    const json = { parts: { R1: '10k', R2: '100k' }, vref: '1 V' };
    const open2 = run(json, sine(1e3, 3), defaultOpamp, { role: 'R2', mode: 'open' });
    expect(open2.values['hysteresis']).toBe(0);
    expect(open2.values['vth.high']).toBe(1);
    const open1 = run(json, sine(1e3, 3), defaultOpamp, { role: 'R1', mode: 'open' });
    expect(open1.values['hysteresis']).toBeCloseTo(21, 9);
    expect(open1.values['freq']).toBe(0);
  });

  test.each([
    [{ parts: { R1: '10k' } }, /stages\[3\]\.parts\.R2: missing/],
    [{ parts: { R1: '10k', R2: '100k' }, periodic: 'yes' }, /stages\[3\]\.periodic: "yes" must be true or false/],
    [{ parts: { R1: '10k', R2: '100k' }, vref: '2 A' }, /stages\[3\]\.vref: .*voltage/],
  ])('plan error %j', (json, message) => {
    expect(() => stage(json)).toThrow(StageParseError);
    expect(() => stage(json)).toThrow(message);
  });
});
