import { describe, expect, test } from 'vitest';
import { rcLowpassKind } from '../../src/circuit/rc-lowpass.js';
import { defaultOpamp } from '../../src/circuit/opamp.js';
import type { Waveform } from '../../src/circuit/types.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { StageParseError } from '../../src/circuit/errors.js';
import { runSpice } from '../helpers/ngspice.js';

function run(r: number, c: number, input: Waveform) {
  return rcLowpassKind.evaluate({ parts: { R: r, C: c }, settings: {}, opamp: defaultOpamp, supplies: { pos: 12, neg: -12 }, rails: {}, input });
}

const shapes: Record<string, (p: number) => number> = {
  sine: (p) => Math.sin(2 * Math.PI * p),
  triangle: (p) => (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4),
  square: (p) => (p < 0.5 ? 1 : -1),
};

describe('rc-lowpass against ngspice', () => {
  test('corner frequency against an ngspice AC sweep', () => {
    const R = 6.8e3;
    const C = 22e-9;
    const t = runSpice(`Vin in 0 DC 0 AC 1\nR1 in out ${R}\nC1 out 0 ${C}`, 'ac dec 400 10 1meg', ['vm(out)']);
    const f = t['frequency'] as Float64Array;
    const m = t['vm(out)'] as Float64Array;
    let i = 0;
    while ((m[i] as number) > Math.SQRT1_2) i++;
    const w = ((m[i - 1] as number) - Math.SQRT1_2) / ((m[i - 1] as number) - (m[i] as number));
    const corner = Math.exp(Math.log(f[i - 1] as number) * (1 - w) + Math.log(f[i] as number) * w);
    const r = run(R, C, fromPhase(1000, shapes['sine'] as (p: number) => number));
    // ngspice AC −3 dB point (400 points/decade, log-interpolated): within 0.5 %.
    expect(Math.abs((r.values['fc'] as number) - corner) / corner).toBeLessThan(0.005);
    // Closed form 1/(2πRC) = 1063.9 Hz.
    expect(r.values['fc']).toBeCloseTo(1 / (2 * Math.PI * R * C), 6);
  });

  test.each(['sine', 'triangle', 'square'])('%s at the corner and at 3× the corner: vpp against an ngspice transient', (shape) => {
    const R = 10e3;
    const C = 15e-9;
    const fc = 1 / (2 * Math.PI * R * C);
    for (const f of [fc, 3 * fc]) {
      const T = 1 / f;
      const src =
        shape === 'sine'
          ? `SIN(0 2 ${f})`
          : shape === 'triangle'
            ? `PWL(0 0 ${T / 4} 2 ${(3 * T) / 4} -2 ${T} 0) r=0`
            : `PULSE(2 -2 ${T / 2} 1n 1n ${T / 2 - 1e-9} ${T})`;
      const t = runSpice(`Vin in 0 ${src}\nR1 in out ${R}\nC1 out 0 ${C}`, `tran ${T / 1000} ${12 * T} ${10 * T} ${T / 1000}`, ['v(out)']);
      const v = t['v(out)'] as Float64Array;
      const spiceVpp = Math.max(...v) - Math.min(...v);
      const r = run(
        R,
        C,
        fromPhase(f, (p) => 2 * (shapes[shape] as (p: number) => number)(p)),
      );
      // ngspice transient, last two of twelve periods: within 1 % (a square's edge is one sample long here).
      expect(Math.abs((r.values['out.vpp'] as number) - spiceVpp) / spiceVpp).toBeLessThan(0.01);
    }
  });

  test('a sine at the corner comes out at 1/√2 (handbook: |H| = 1/√(1 + (f/fc)²))', () => {
    const fc = 1 / (2 * Math.PI * 10e3 * 15e-9);
    const r = run(
      10e3,
      15e-9,
      fromPhase(fc, (p) => Math.sin(2 * Math.PI * p), 1024),
    );
    // At the corner a single-pole RC passes 1/√2 of the amplitude (handbook): 1e-4.
    expect(Math.abs((r.values['out.vpp'] as number) / 2 - Math.SQRT1_2)).toBeLessThan(1e-4);
  });

  test('DC passes unchanged', () => {
    const r = run(10e3, 15e-9, { frequency: 0, samples: new Float64Array([2.5]) });
    expect(r.outputs['out']?.samples[0]).toBe(2.5);
  });
});

describe('rc-lowpass plan', () => {
  test.each([
    [{ parts: { R: '10k' } }, /stages\[4\]\.parts\.C: missing; write a capacitance, e.g. "10n 5%"/],
    [{ parts: { R: '10k', C: '10k' } }, /stages\[4\]\.parts\.C: "10k" reads as 10 kF, not a plausible value here; write e\.g\. "10n 5%"/],
    [{ parts: { R: '10k', C: '10 ohm' } }, /stages\[4\]\.parts\.C: .*resistance.*capacitance/],
  ])('%j', (json, message) => {
    const parse = () => rcLowpassKind.parse({ json, path: 'stages[4]' }, 'x.plan.json');
    expect(parse).toThrow(StageParseError);
    expect(parse).toThrow(message);
  });
});

describe('loadedCorner (the bracketing search behind the loaded corner)', () => {
  test('a resistive load: the Thevenin corner 1/(2π·(R‖RL)·C) to 1e-8', async () => {
    const { loadedCorner } = await import('../../src/circuit/rc-lowpass.js');
    const r = 2200;
    const rl = 10_000;
    const c = 4.7e-9;
    // |H|² of R into C ‖ RL (Kirchhoff at the node): 1/((1 + R/RL)² + (ωRC)²).
    const mag2 = (f: number): number => 1 / ((1 + r / rl) ** 2 + (2 * Math.PI * f * r * c) ** 2);
    // Thevenin equivalent of R and RL driving C (any circuits handbook).
    const expected = 1 / (2 * Math.PI * ((r * rl) / (r + rl)) * c);
    expect(Math.abs(loadedCorner(mag2, expected * 3) / expected - 1)).toBeLessThan(1e-8);
    expect(Math.abs(loadedCorner(mag2, expected / 50) / expected - 1)).toBeLessThan(1e-8);
  });

  test('a response that rises again (a resonant load): started on the rising crossing, it still returns a falling one', async () => {
    const { loadedCorner } = await import('../../src/circuit/rc-lowpass.js');
    // A single pole at 1 kHz times a resonant bump at 20 kHz, +30 dB at its top (|h|² ×1000), Q 10:
    // |1 − u² + j·u·G/Q|² / |1 − u² + j·u/Q|², u = f/f0 (a second-order section's magnitude, any filter handbook).
    const g = Math.sqrt(1000);
    const mag2 = (f: number): number => {
      const u = f / 20_000;
      const bump = ((1 - u * u) ** 2 + ((u * g) / 10) ** 2) / ((1 - u * u) ** 2 + (u / 10) ** 2);
      return bump / (1 + (f / 1000) ** 2);
    };
    // The rising crossing below the bump, by a scan (half of |h(0)|² = 0.5).
    let rising = Number.NaN;
    for (let f = 2000; f < 20_000; f *= 1.001) {
      if (mag2(f) < 0.5 && mag2(f * 1.001) >= 0.5) {
        rising = f;
        break;
      }
    }
    expect(rising).toBeGreaterThan(2000);
    const fc = loadedCorner(mag2, rising);
    // Falling through half there: above it just before, below it just after.
    expect(mag2(fc * 0.999)).toBeGreaterThan(0.5);
    expect(mag2(fc * 1.001)).toBeLessThan(0.5);
  });
});
