import FFT from 'fft.js';

/**
 * The periodic steady state of a linear network with several outputs, driven
 * by one period of a waveform: harmonic k of the input (frequency k·f) comes
 * out at output j multiplied by Hj(k·f), the DC level by `dcGains[j]`.
 * `gain(f, into)` writes [Re H0, Im H0, Re H1, Im H1, …] at f into `into`.
 *
 * One real FFT of the input and one inverse per output (fft.js, radix-4) for
 * power-of-two lengths, a direct DFT otherwise. Harmonics the input does not
 * carry (below 1e-12 of its largest) are skipped, so a sine costs one call of
 * `gain` instead of n/2: the transistor stage runs this in every trial.
 */
export function filterHarmonics(
  samples: Float64Array,
  frequency: number,
  outs: readonly Float64Array[],
  dcGains: readonly number[],
  gain: (f: number, into: Float64Array) => void,
): void {
  const n = samples.length;
  const m = outs.length;
  const g = scratch(2 * m);
  if (n < 4 || (n & (n - 1)) !== 0) {
    direct(samples, frequency, outs, dcGains, gain, g);
    return;
  }
  const t = transformFor(n);
  if (t.gains.length < 2 * m * (n / 2 + 1)) t.gains = new Float64Array(2 * m * (n / 2 + 1));
  t.fft.realTransform(t.spectrum, samples);
  t.fft.completeSpectrum(t.spectrum);
  const x = t.spectrum;
  let largest = 0;
  for (let k = 0; k <= n / 2; k++) largest = Math.max(largest, Math.hypot(x[2 * k] as number, x[2 * k + 1] as number));
  const floor = 1e-12 * largest;
  for (let j = 0; j < m; j++) {
    const y = t.work;
    y.fill(0);
    y[0] = (x[0] as number) * (dcGains[j] ?? 0);
    for (let k = 1; k <= n / 2; k++) {
      const re = x[2 * k] as number;
      const im = x[2 * k + 1] as number;
      if (Math.abs(re) + Math.abs(im) <= floor) continue;
      // The gains of every output at this harmonic, computed once (for output 0) and reused.
      if (j === 0) {
        gain(k * frequency, g);
        const row = t.gains;
        for (let i = 0; i < 2 * m; i++) row[(2 * m) * k + i] = g[i] as number;
      }
      const gr = t.gains[2 * m * k + 2 * j] as number;
      const gi = t.gains[2 * m * k + 2 * j + 1] as number;
      const yr = re * gr - im * gi;
      const yi = re * gi + im * gr;
      y[2 * k] = yr;
      // The negative frequency holds the conjugate, so the result stays real (bin n/2 is its own mirror).
      if (k < n / 2) {
        y[2 * k + 1] = yi;
        y[2 * (n - k)] = yr;
        y[2 * (n - k) + 1] = -yi;
      }
    }
    t.fft.inverseTransform(t.result, y);
    const out = outs[j] as Float64Array;
    for (let i = 0; i < n; i++) out[i] = t.result[2 * i] as number;
  }
}

function direct(
  samples: Float64Array,
  frequency: number,
  outs: readonly Float64Array[],
  dcGains: readonly number[],
  gain: (f: number, into: Float64Array) => void,
  g: Float64Array,
): void {
  const n = samples.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += samples[i] as number;
  mean /= n;
  outs.forEach((out, j) => {
    out.fill(mean * (dcGains[j] ?? 0));
  });
  for (let k = 1; k <= Math.floor(n / 2); k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const w = (2 * Math.PI * k * i) / n;
      re += (samples[i] as number) * Math.cos(w);
      im -= (samples[i] as number) * Math.sin(w);
    }
    if (re === 0 && im === 0) continue;
    gain(k * frequency, g);
    // Bin k and its mirror: amplitude 2/n, except at exactly n/2.
    const scale = 2 * k === n ? 1 / n : 2 / n;
    outs.forEach((out, j) => {
      const gr = g[2 * j] as number;
      const gi = g[2 * j + 1] as number;
      const yr = (re * gr - im * gi) * scale;
      const yi = (re * gi + im * gr) * scale;
      for (let i = 0; i < n; i++) {
        const w = (2 * Math.PI * k * i) / n;
        out[i] = (out[i] as number) + yr * Math.cos(w) - yi * Math.sin(w);
      }
    });
  }
}

const scratches = new Map<number, Float64Array>();
function scratch(length: number): Float64Array {
  let s = scratches.get(length);
  if (!s) {
    s = new Float64Array(length);
    scratches.set(length, s);
  }
  return s;
}

interface Transform {
  readonly fft: FFT;
  readonly spectrum: number[];
  readonly work: number[];
  readonly result: number[];
  /** Gains by harmonic, 2·outputs numbers per harmonic, grown as needed. */
  gains: Float64Array;
}

const transforms = new Map<number, Transform>();

function transformFor(n: number): Transform {
  let t = transforms.get(n);
  if (!t) {
    const fft = new FFT(n);
    t = { fft, spectrum: fft.createComplexArray(), work: fft.createComplexArray(), result: fft.createComplexArray(), gains: new Float64Array(0) };
    transforms.set(n, t);
  }
  return t;
}
