import { describe, expect, test } from 'vitest';
import { rcHighpassKind } from '../../src/circuit/rc-highpass.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import { StageParseError } from '../../src/circuit/errors.js';
import type { Complex, StageFault, Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { corner, runSpice } from '../helpers/ngspice.js';

function run(c: number, r: number, input: Waveform, load?: (output: string, f: number) => Complex | undefined, fault?: StageFault) {
  return rcHighpassKind.evaluate({ parts: { C: c, R: r }, settings: {}, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {}, input, load, fault });
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const sine = (peak: number, f: number): Waveform => fromPhase(f, (p) => peak * Math.sin(2 * Math.PI * p));

/** The rising −3 dB point of an AC sweep (|H| goes up through 1/√2 of its top value). */
function risingCorner(t: Record<string, Float64Array>): number {
  const f = t['frequency'] as Float64Array;
  const m = t['vm(out)'] as Float64Array;
  // Mirror the sweep so the helper's falling-corner search applies.
  return corner(f.slice().reverse(), m.slice().reverse());
}

describe('rc-highpass against ngspice', () => {
  test.each([
    { name: 'unloaded', C: 100e-9, R: 10e3, RL: undefined },
    { name: 'loaded by 10 kΩ (corner doubles)', C: 100e-9, R: 10e3, RL: 10e3 },
    { name: 'loaded by 47 kΩ ∥ 1 nF (a scope lead and an input)', C: 47e-9, R: 22e3, RL: 47e3, CL: 1e-9 },
  ])('$name: corner frequency against an ngspice AC sweep', ({ C, R, RL, CL }) => {
    const load = RL === undefined ? '' : `\nRL out 0 ${RL}${CL ? `\nCL out 0 ${CL}` : ''}`;
    const t = runSpice(`Vin in 0 DC 0 AC 1\nC1 in out ${C}\nR1 out 0 ${R}${load}`, 'ac dec 1000 0.1 10meg', ['vm(out)']);
    const loadFn =
      RL === undefined
        ? undefined
        : (_o: string, f: number): Complex => {
            // RL ∥ CL as a complex impedance.
            const yr = 1 / RL;
            const yi = 2 * Math.PI * f * (CL ?? 0);
            const d = yr * yr + yi * yi;
            return { re: yr / d, im: -yi / d };
          };
    const r = run(C, R, sine(1, 1000), loadFn);
    // ngspice AC −3 dB point (1000 points a decade, log-interpolated): within 0.5 %.
    expect(rel(r.values['fc'] as number, risingCorner(t))).toBeLessThan(0.005);
    if (RL === undefined) expect(r.values['fc']).toBeCloseTo(1 / (2 * Math.PI * R * C), 9);
  });

  test.each([
    { name: 'square at 10·fc (the top tilts)', shape: 'square', ratio: 10 },
    { name: 'square at fc', shape: 'square', ratio: 1 },
    { name: 'triangle at 3·fc', shape: 'triangle', ratio: 3 },
  ])('$name: out.vpp against an ngspice transient', ({ shape, ratio }) => {
    const C = 100e-9;
    const R = 4.7e3;
    const f = ratio / (2 * Math.PI * R * C);
    const T = 1 / f;
    const src = shape === 'square' ? `PULSE(1 -1 ${T / 2} 1n 1n ${T / 2 - 1e-9} ${T})` : `PWL(0 0 ${T / 4} 1 ${(3 * T) / 4} -1 ${T} 0) r=0`;
    const t = runSpice(`Vin in 0 ${src}\nC1 in out ${C}\nR1 out 0 ${R}`, `tran ${T / 2000} ${40 * T} ${35 * T} ${T / 2000}`, ['v(out)']);
    const v = t['v(out)'] as Float64Array;
    const spiceVpp = Math.max(...v) - Math.min(...v);
    const wave = fromPhase(f, (p) => (shape === 'square' ? (p < 0.5 ? 1 : -1) : p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4), 1024);
    // ngspice transient, last five of forty periods: within 1 %.
    expect(rel(run(C, R, wave).values['out.vpp'] as number, spiceVpp)).toBeLessThan(0.01);
  });
});

describe('rc-highpass closed forms', () => {
  test('worked by hand: 10 kΩ and 100 nF give f3dB = 1/(2πRC) = 159.15 Hz (Horowitz and Hill, The Art of Electronics, the RC high-pass; from memory)', () => {
    const r = run(100e-9, 10e3, sine(1, 1000));
    expect(r.values['fc'] as number).toBeCloseTo(159.155, 3);
    // At 10·fc the output is 1/√(1 + 0.01) of the input: 0.995 (2 Vpp in → 1.990 Vpp).
    const at10 = run(100e-9, 10e3, sine(1, 1591.55));
    expect(at10.values['out.vpp'] as number).toBeCloseTo(2 / Math.sqrt(1.01), 3);
  });
  test('a sine at the corner comes out at 1/√2, 45° ahead (handbook: H = j(f/fc)/(1 + j(f/fc)))', () => {
    const fc = 1 / (2 * Math.PI * 10e3 * 100e-9);
    const r = run(100e-9, 10e3, sine(1, fc));
    const out = r.outputs['out']?.samples as Float64Array;
    expect(r.values['out.vpp'] as number).toBeCloseTo(Math.SQRT2, 3);
    // 45° ahead: at phase 0 of the input the output is already at sin(45°)/√2 = 0.5.
    expect(out[0] as number).toBeCloseTo(0.5, 6);
  });
  test('DC is blocked', () => {
    const r = run(100e-9, 10e3, { frequency: 0, samples: new Float64Array([2.5]) });
    expect(r.outputs['out']?.samples[0]).toBe(0);
  });
  test('output impedance: R ∥ 1/(jωC); input impedance: R + 1/(jωC) (circuit theory)', () => {
    const x = { parts: { C: 100e-9, R: 10e3 }, settings: {}, opamp: defaultOpamp };
    const fc = 1 / (2 * Math.PI * 10e3 * 100e-9);
    const zo = rcHighpassKind.outputImpedance?.(x, 'out', fc);
    expect(zo?.re).toBeCloseTo(5e3, 6);
    expect(zo?.im).toBeCloseTo(-5e3, 6);
    const zi = rcHighpassKind.inputImpedance?.(x, fc);
    expect(zi?.re).toBeCloseTo(10e3, 6);
    expect(zi?.im).toBeCloseTo(-10e3, 6);
  });
});

describe('rc-highpass faults', () => {
  test.each([
    { fault: { role: 'C', mode: 'open' } as StageFault, vpp: 0 },
    { fault: { role: 'C', mode: 'short' } as StageFault, vpp: 2 },
    { fault: { role: 'R', mode: 'short' } as StageFault, vpp: 0 },
    { fault: { role: 'R', mode: 'open' } as StageFault, vpp: 2 },
  ])('$fault.role $fault.mode: out.vpp $vpp for 2 Vpp in below the corner', ({ fault, vpp }) => {
    const r = run(100e-9, 10e3, sine(1, 20), undefined, fault);
    expect(r.values['out.vpp'] as number).toBeCloseTo(vpp, 4);
  });
  test('R open but the next stage loads it: the load takes R’s place', () => {
    const r = run(100e-9, 10e3, sine(1, 1000), () => ({ re: 22e3, im: 0 }), { role: 'R', mode: 'open' });
    expect(rel(r.values['fc'] as number, 1 / (2 * Math.PI * 22e3 * 100e-9))).toBeLessThan(1e-6);
  });
  test('C shorted passes DC', () => {
    const r = run(100e-9, 10e3, { frequency: 0, samples: new Float64Array([2.5]) }, undefined, { role: 'C', mode: 'short' });
    expect(r.outputs['out']?.samples[0]).toBeCloseTo(2.5, 3);
  });
});

describe('rc-highpass plan', () => {
  test.each([
    [{ parts: { C: '100n' } }, /stages\[4\]\.parts\.R: missing; write a resistance, e\.g\. "10k 1%"/],
    [{ parts: { C: '10k', R: '10k' } }, /stages\[4\]\.parts\.C: "10k" reads as 10 kF, not a plausible value here/],
    [{ parts: { C: '100n', R: '10k', Rload: '1k' } }, /stages\[4\]\.parts\.Rload: is not a key here/],
  ])('%j', (json, message) => {
    const parse = () => rcHighpassKind.parse({ json, path: 'stages[4]' }, 'x.plan.json');
    expect(parse).toThrow(StageParseError);
    expect(parse).toThrow(message);
  });
});
