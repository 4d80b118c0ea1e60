import FFT from 'fft.js';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { componentAt, harmonicAnalysis } from '../../src/signal/harmonics.js';
import { gaussian } from './signals.js';

/**
 * The periodic Hann window, w[n] = 0.5 − 0.5·cos(2πn/N), and its sum, written
 * out here rather than taken from the code under test (F. J. Harris, Proc. IEEE
 * 66(1), 1978, from memory).
 */
function hann(length: number): { w: Float64Array; sum: number } {
  const w = Float64Array.from({ length }, (_, n) => 0.5 - 0.5 * Math.cos((2 * Math.PI * n) / length));
  return { w, sum: w.reduce((s, v) => s + v, 0) };
}

/** A direct DFT at any frequency, written out term by term (the textbook definition). */
function directDft(x: Float64Array, w: Float64Array, nu: number): { re: number; im: number } {
  let re = 0;
  let im = 0;
  for (let n = 0; n < x.length; n++) {
    re += (x[n] ?? 0) * (w[n] ?? 0) * Math.cos(2 * Math.PI * nu * n);
    im -= (x[n] ?? 0) * (w[n] ?? 0) * Math.sin(2 * Math.PI * nu * n);
  }
  return { re, im };
}

describe('componentAt against independent transforms', () => {
  test('matches a direct DFT on small random inputs at any frequency (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 8, max: 300 }), fc.double({ min: 0, max: 0.5, noNaN: true }), fc.integer({ min: 1, max: 1e6 }), (n, nu, seed) => {
        const g = gaussian(seed);
        const x = Float64Array.from({ length: n }, () => g());
        const window = hann(n);
        const mine = componentAt(x, 0, n, nu);
        const ref = directDft(x, window.w, nu);
        // Rounding only: 1e-9 relative to the signal's size.
        expect(Math.abs(mine.amplitude - (2 * Math.hypot(ref.re, ref.im)) / window.sum)).toBeLessThan(1e-9 * Math.sqrt(n));
      }),
      { numRuns: 60 },
    );
  });

  test('harmonic amplitudes match fft.js bins on a coherently sampled record', () => {
    // 16 periods of 256 samples: harmonic k sits on FFT bin 16·k exactly, where
    // the rectangular FFT (fft.js, an independent library) is exact.
    const period = 256;
    const periods = 16;
    const size = period * periods;
    const g = gaussian(3);
    const amps = Array.from({ length: 51 }, (_, k) => (k === 0 ? 0 : k === 1 ? 1 : (0.2 * Math.abs(g())) / k));
    const x = Float64Array.from({ length: size }, (_, i) => {
      let v = 0.7;
      for (let k = 1; k <= 50; k++) v += (amps[k] ?? 0) * Math.sin((2 * Math.PI * k * i) / period + k);
      return v;
    });
    const fft = new FFT(size);
    const out = fft.createComplexArray() as number[];
    fft.realTransform(out, Array.from(x));
    fft.completeSpectrum(out);
    const h = harmonicAnalysis(x, 0, period, periods, 0.7);
    expect(h.highest).toBe(50);
    let rss = 0;
    for (let k = 1; k <= 50; k++) {
      const bin = k * periods;
      const ref = (2 * Math.hypot(out[2 * bin] ?? 0, out[2 * bin + 1] ?? 0)) / size;
      // fft.js (an independent library) on the same whole-period record: the same amplitudes to 1e-9.
      expect(Math.abs((h.amplitudes[k] ?? 0) - ref)).toBeLessThan(1e-9);
      if (k > 1) rss += ref * ref;
    }
    const fundamental = (2 * Math.hypot(out[2 * periods] ?? 0, out[2 * periods + 1] ?? 0)) / size;
    expect(Math.abs(h.thd - Math.sqrt(rss) / fundamental)).toBeLessThan(1e-9);
  });

  test('harmonics stop below half the sample rate', () => {
    // 40.5 samples per period: k·f < fs/2 means k ≤ 20.
    const x = Float64Array.from({ length: 4050 }, (_, i) => Math.sin((2 * Math.PI * i) / 40.5));
    expect(harmonicAnalysis(x, 0, 40.5, 100, 0).highest).toBe(20);
  });
});

describe('a harmonic exactly at half the sample rate (even period length)', () => {
  // With 40 samples per period harmonic 20 sits exactly at fs/2, where a sampled
  // cosine cannot be told from its alias and a sine reads zero (Nyquist–Shannon
  // sampling theorem): it is no harmonic to count. Test signal: a unit sine plus
  // 0.3·(−1)^n, a component exactly at fs/2 (invented values).
  const period = 40;
  const x = Float64Array.from({ length: period * 20 }, (_, i) => Math.sin((2 * Math.PI * i) / period) + 0.3 * (i % 2 === 0 ? 1 : -1));

  test('harmonics stop at 19, below fs/2, and the fs/2 component adds nothing to the THD', () => {
    const h = harmonicAnalysis(x, 0, period, 20, 0);
    expect(h.highest).toBe(19);
    // Harmonics 2…19 of this signal are zero (it has none), so THD is zero up to
    // the Hann window's leakage of the fs/2 line, which lies 20 periods' bins away: < 1e-9.
    expect(h.thd).toBeLessThan(1e-9);
    expect(h.amplitudes[1]).toBeCloseTo(1, 9);
  });

  test('the same with 41 samples a period (odd): harmonic 20 lies below fs/2 and is counted', () => {
    expect(
      harmonicAnalysis(
        Float64Array.from({ length: 41 * 20 }, (_, i) => Math.sin((2 * Math.PI * i) / 41)),
        0,
        41,
        20,
        0,
      ).highest,
    ).toBe(20);
  });
});
