import { describe, expect, test } from 'vitest';
import { type Evidence, logLikelihood, reproduces, sigmaOf } from '../../src/analysis/diagnose-evidence.js';
import type { Unit } from '../../src/units/unit.js';

/** A reading for the likelihood, built by hand: its check at `index`, its U, the healthy spread σ. */
function evidence(index: number, unit: Unit, value: number, nominal: number, u: number, spread: number): Evidence {
  return {
    check: `c${index}`,
    index,
    value,
    verdict: 'fail',
    unit,
    stage: 's',
    target: { check: `c${index}`, unit, nominal, worst: { min: nominal, max: nominal }, stat: { min: nominal - 3 * spread, max: nominal + 3 * spread } },
    u,
    spread,
    deviates: true,
  };
}

describe('diagnosis likelihood', () => {
  // Hand-worked: the likelihood of two independent readings is the product of two normal
  // densities N(x; μ, σ) = exp(−(x − μ)²/(2σ²)) / (σ√(2π)) (any statistics text), so its
  // logarithm is the sum of the two terms. σ combines, root-sum-square (JCGM 100:2008),
  // the instrument (U/2), the healthy spread and the model's error (half of 1.5 % for Hz,
  // 1 % for V/V, as stated in diagnose-evidence.ts).
  test('two readings: the sum of two Gaussian log terms, worked by hand', () => {
    // Reading 1: 1010 Hz against a prediction of 1000 Hz, U = 20 Hz, no spread:
    //   σ₁ = √(10² + 7.5²) = 12.5 Hz, z₁ = 0.8, ln N = −0.32 − 2.525729 − 0.918939 = −3.764668.
    // Reading 2: 1.95 V/V against 2 V/V, U = 0, spread 0.03:
    //   σ₂ = √(0.03² + 0.01²) = 0.0316228, z₂ = −1.581139, ln N = −1.25 + 3.453878 − 0.918939 = 1.284940.
    const e = [evidence(0, 'Hz', 1010, 1000, 20, 0), evidence(1, 'V/V', 1.95, 2, 0, 0.03)];
    const predicted = Float64Array.from([1000, 2]);
    expect(sigmaOf(e[0] as Evidence, 1000)).toBeCloseTo(12.5, 9);
    expect(sigmaOf(e[1] as Evidence, 2)).toBeCloseTo(Math.sqrt(0.001), 9);
    // Tolerance 1e-5: the hand arithmetic above is carried to six decimals.
    expect(logLikelihood(e, predicted)).toBeCloseTo(-3.764668 + 1.28494, 5);
    // The product of the two densities, computed directly from the textbook form.
    const density = (x: number, mu: number, s: number) => Math.exp(-((x - mu) ** 2) / (2 * s * s)) / (s * Math.sqrt(2 * Math.PI));
    expect(Math.exp(logLikelihood(e, predicted))).toBeCloseTo(density(1010, 1000, 12.5) * density(1.95, 2, Math.sqrt(0.001)), 9);
  });

  test('a prediction closer to the readings is more likely', () => {
    const e = [evidence(0, 'Hz', 1010, 1000, 20, 0), evidence(1, 'V/V', 1.95, 2, 0, 0.03)];
    expect(logLikelihood(e, Float64Array.from([1008, 1.96]))).toBeGreaterThan(logLikelihood(e, Float64Array.from([1000, 2])));
  });

  test('verification: a prediction within U + model error + 3σ of spread reproduces the reading; one beyond does not', () => {
    // Allowed for 1010 Hz read with U = 20 Hz and no spread: 20 + 1.5 % of the prediction.
    const e = evidence(0, 'Hz', 1010, 1000, 20, 0);
    expect(reproduces(e, 1000)).toBe(true); // |1010 − 1000| = 10 ≤ 20 + 15
    expect(reproduces(e, 970)).toBe(false); // 40 > 20 + 14.55
    // "No value" (an oscillator that stopped) reproduces only a reading of about zero.
    expect(reproduces(e, Number.NaN)).toBe(false);
    expect(reproduces(evidence(0, 'Hz', 0, 1000, 0.01, 0), Number.NaN)).toBe(true);
  });
});
