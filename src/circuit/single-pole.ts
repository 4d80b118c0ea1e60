/**
 * The periodic steady state of a first-order low-pass, DC gain 1 and corner fc,
 * driven by one period of a waveform (`samples` over one period 1/frequency).
 *
 * The input is taken as linear between samples, which is exact for a triangle and
 * close for anything smooth; a square's edge becomes one sample long. Over each
 * sample step the error e = y − x obeys de/dt = −e/τ − x′ with x′ constant, whose
 * exact solution gives e₁ = a·e₀ − (x₁ − x₀)·(τ/h)·(1 − a), a = e^(−h/τ). A first
 * pass from e₀ = 0 gives the period map e_N = a^N·e₀ + c; the periodic solution
 * starts at e₀ = c / (1 − a^N). Every harmonic of the input is attenuated and
 * delayed as 1/(1 + j·f/fc), which is why a square or a triangle comes out right,
 * at the cost of two passes and one exp (no FFT).
 */
export function singlePole(samples: Float64Array, frequency: number, fc: number, into?: Float64Array): Float64Array {
  const n = samples.length;
  // `into` (a trial's reused array, see EvalInput.buffer) must not be `samples`: the passes read the input throughout.
  const out = into && into.length === n && into !== samples ? into : new Float64Array(n);
  if (!(frequency > 0) || fc === Number.POSITIVE_INFINITY || n === 0) {
    out.set(samples);
    return out;
  }
  const h = 1 / (frequency * n);
  const tau = 1 / (2 * Math.PI * fc);
  const a = Math.exp(-h / tau);
  const b = (tau / h) * -Math.expm1(-h / tau);
  const aN = Math.exp(-1 / (frequency * tau));
  if (1 - aN < 1e-12) {
    // The corner is so far below the signal that only the DC level passes.
    let mean = 0;
    for (let i = 0; i < n; i++) mean += samples[i] as number;
    out.fill(mean / n);
    return out;
  }
  const first = samples[0] as number;
  // The first pass from e₀ = 0 is the sum c = Σᵢ a^(N−i)·dᵢ, dᵢ = −(xᵢ − xᵢ₋₁)·b (i = 1 … N,
  // x_N = x₀): four interleaved Horner chains in a⁴, one per i mod 4, joined at the end, so
  // the multiply-adds do not wait on each other (the same sum, rounded in another order).
  const a2 = a * a;
  const a4 = a2 * a2;
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let i = 1;
  for (; i + 3 <= n - 1; i += 4) {
    const x0 = samples[i - 1] as number;
    const x1 = samples[i] as number;
    const x2 = samples[i + 1] as number;
    const x3 = samples[i + 2] as number;
    const x4 = samples[i + 3] as number;
    s0 = a4 * s0 - (x1 - x0) * b;
    s1 = a4 * s1 - (x2 - x1) * b;
    s2 = a4 * s2 - (x3 - x2) * b;
    s3 = a4 * s3 - (x4 - x3) * b;
  }
  // The chains stop at i − 1 … i + 2 (the last four terms so far): e after them is Σ a^(3−r)·s_r.
  let e = a * (a * (a * s0 + s1) + s2) + s3;
  let x0 = samples[i - 1] as number;
  for (; i <= n; i++) {
    const x1 = i < n ? (samples[i] as number) : first;
    e = a * e - (x1 - x0) * b;
    x0 = x1;
  }
  e /= 1 - aN;
  x0 = first;
  for (let i = 0; i < n; i++) {
    out[i] = x0 + e;
    const x1 = i + 1 < n ? (samples[i + 1] as number) : first;
    e = a * e - (x1 - x0) * b;
    x0 = x1;
  }
  return out;
}
