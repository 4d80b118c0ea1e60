import { describe, expect, test } from 'vitest';
import { fastThd } from '../../src/circuit/spectrum.js';
import { fromPhase, thd } from '../../src/circuit/waveform.js';

// Invented test signals: a fundamental with chosen harmonic amplitudes.
const harmonics: ReadonlyArray<[number, number, number]> = [
  [1, 1, 0],
  [2, 0.03, 0.4],
  [3, 0.1, 1.1],
  [5, 0.05, 2.0],
  [7, 0.02, 0.3],
];
const tone = (p: number): number => harmonics.reduce((s, [k, a, phi]) => s + a * Math.sin(2 * Math.PI * k * p + phi), 0);

// THD as the root-sum-square of the harmonic amplitudes over the fundamental's
// (the THD-F definition of IEEE Std 519 and IEC 61000-4-7, from memory): here
// √(0.03² + 0.1² + 0.05² + 0.02²) / 1, worked by hand.
const expected = Math.sqrt(0.03 ** 2 + 0.1 ** 2 + 0.05 ** 2 + 0.02 ** 2);

describe('fastThd (one real FFT) against the THD definition', () => {
  test('a synthesised tone with known harmonics, power-of-two record (FFT path)', () => {
    const w = fromPhase(1e3, tone, 256);
    // The hand-worked RSS of the synthesised harmonics above.
    expect(fastThd(w.samples)).toBeCloseTo(expected, 12);
    // And the direct DFT of waveform.ts on the same record agrees with it.
    expect(fastThd(w.samples)).toBeCloseTo(thd(w), 12);
  });

  test('a record that is not a power of two goes the direct way and still meets the definition', () => {
    const w = fromPhase(1e3, tone, 200);
    expect(fastThd(w.samples)).toBeCloseTo(expected, 12);
  });

  test('harmonics above `highest` are left out, as in thd()', () => {
    const w = fromPhase(1e3, tone, 256);
    // Only harmonics 2 and 3 counted: √(0.03² + 0.1²), by hand.
    expect(fastThd(w.samples, 3)).toBeCloseTo(Math.hypot(0.03, 0.1), 12);
    expect(fastThd(w.samples, 3)).toBeCloseTo(thd(w, 3), 12);
  });

  test('a square wave: odd harmonics 4/(πk), THD to the 49th by the Fourier series (handbook)', () => {
    const w = fromPhase(1e3, (p) => (p < 0.5 ? 1 : -1), 1024);
    // Fourier series of a ±1 square: amplitude 4/(πk) for odd k, so THD to k = 49 is
    // √(Σ 1/k², k = 3, 5 … 49) (the record's sampling adds a small aliasing error).
    let sum = 0;
    for (let k = 3; k <= 49; k += 2) sum += 1 / (k * k);
    expect(Math.abs(fastThd(w.samples) - Math.sqrt(sum))).toBeLessThan(2e-3);
    expect(fastThd(w.samples)).toBeCloseTo(thd(w), 12);
  });

  test('no fundamental gives NaN, on both paths', () => {
    expect(fastThd(new Float64Array(256))).toBeNaN();
    expect(fastThd(new Float64Array(200))).toBeNaN();
  });
});

describe('the record length is even: its last bin lies exactly at half the sample rate', () => {
  // Eight samples of a unit sine plus 0.3·(−1)^n: bin 4 of 8 is exactly fs/2, no
  // harmonic (Nyquist–Shannon); harmonics 2 and 3 are zero, so the THD is 0.
  // Invented values; worked by hand.
  const samples = Float64Array.from({ length: 8 }, (_, i) => Math.sin((2 * Math.PI * i) / 8) + 0.3 * (i % 2 === 0 ? 1 : -1));

  test('fastThd (FFT path) leaves the fs/2 bin out', () => {
    expect(fastThd(samples)).toBeLessThan(1e-12);
  });

  test('thd() (direct path) leaves it out too', () => {
    expect(thd({ frequency: 1e3, samples })).toBeLessThan(1e-12);
  });
});
