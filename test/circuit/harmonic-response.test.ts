import { describe, expect, test } from 'vitest';
import { applyResponse, type ComplexSlot } from '../../src/circuit/harmonic-response.js';
import { singlePole } from '../../src/circuit/single-pole.js';
import { fromPhase } from '../../src/circuit/waveform.js';
import { runSpice } from '../helpers/ngspice.js';

/** H(f) = 1/(1 + j·f/fc) (first-order RC low-pass, any circuits handbook). */
function low(fc: number) {
  return (f: number, slot: ComplexSlot) => {
    const x = f / fc;
    slot.re = 1 / (1 + x * x);
    slot.im = -x / (1 + x * x);
  };
}

/** Its complement j(f/fc)/(1 + j·f/fc), the RC high-pass. */
function high(fc: number) {
  return (f: number, slot: ComplexSlot) => {
    const x = f / fc;
    slot.re = (x * x) / (1 + x * x);
    slot.im = x / (1 + x * x);
  };
}

describe('applyResponse (the harmonic filter the transistor stage runs its collector and emitter through)', () => {
  test.each([256, 200])(
    'a 1 kHz square through an RC at 1.5 kHz, %i samples: the low-pass matches an ngspice transient and the two outputs sum to the input',
    (n) => {
      const f = 1e3;
      const fc = 1.5e3;
      const square = fromPhase(f, (p) => (p < 0.5 ? 1 : -1), n);
      const lo = applyResponse(square.samples, f, low(fc), new Float64Array(n));
      const hi = applyResponse(square.samples, f, high(fc), new Float64Array(n));
      // ngspice transient of the same RC (R = 1k, C = 1/(2π·1k·1.5 kHz)), last period: peak within 1 %.
      const T = 1 / f;
      const t = runSpice(
        `Vin in 0 PULSE(1 -1 ${T / 2} 1n 1n ${T / 2 - 1e-9} ${T})\nR1 in out 1000\nC1 out 0 ${1 / (2 * Math.PI * 1000 * fc)}`,
        `tran ${T / 2000} ${12 * T} ${11 * T} ${T / 2000}`,
        ['v(out)'],
      );
      const spicePeak = Math.max(...(t['v(out)'] as Float64Array));
      expect(Math.abs(Math.max(...lo) - spicePeak) / spicePeak).toBeLessThan(0.01);
      // The same steady state as the time-domain single-pole solver (itself checked against ngspice in rc-lowpass.test.ts):
      // within 2 % of the peak, sample by sample (the edges differ by the input's one-sample transition).
      const ref = singlePole(square.samples, f, fc);
      let worst = 0;
      for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs((lo[i] as number) - (ref[i] as number)));
      expect(worst).toBeLessThan(0.02);
      // H + (1 − H) = 1: low-pass plus high-pass gives the input back, to rounding.
      for (let i = 0; i < n; i++) expect((lo[i] as number) + (hi[i] as number)).toBeCloseTo(square.samples[i] as number, 9);
    },
  );

  test('a sine comes out at |H| with the phase of H (a lag for the low-pass)', () => {
    const n = 512;
    const sine = fromPhase(1e3, (p) => Math.sin(2 * Math.PI * p), n);
    const lo = applyResponse(sine.samples, 1e3, low(1e3), new Float64Array(n));
    // At f = fc: amplitude 1/√2 and 45° lag, so the output is sin(2πp − π/4)/√2.
    for (let i = 0; i < n; i += 37) expect(lo[i] as number).toBeCloseTo(Math.sin(2 * Math.PI * (i / n) - Math.PI / 4) / Math.SQRT2, 9);
  });
});
