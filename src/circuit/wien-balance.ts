import type { ComplexSlot } from './harmonic-response.js';
import { findRoot } from './response-search.js';

/**
 * Harmonic balance for the Wien-bridge oscillator, refining the describing-
 * function solution. The gain path's output carries odd harmonics (the diodes
 * round its peaks, the swing flattens them); the bridge returns them to the
 * (+) input attenuated by β(k·ω) and shifted in phase, and the path then maps
 * that distorted input to a fundamental slightly out of phase with it. The
 * oscillation settles where, with the harmonics at the (+) input consistent
 * with the output (V⁺ₖ = β(kω)·OUTₖ, k ≥ 2), the fundamental closes the loop:
 * N·L(ω) = 1, N = OUT₁/V⁺₁ now complex, L = β − 1/A as in wien-bridge.ts.
 * Alternates: ω from the phase condition, the amplitude from the magnitude
 * condition, then the harmonics; three rounds suffice (the harmonics are a few
 * per cent of the fundamental and converge geometrically).
 *
 * Phasors: a signal Re(P·e^(jkθ)); one period of m samples x has
 * P_k = (2/m)·Σ x_i·e^(−jkθ_i). The fundamental of V⁺ is a·sin θ (P₁ = −j·a).
 */
export interface BalanceProblem {
  /** The gain path from the (+) input to the output (swing included). */
  readonly shape: (v: number) => number;
  /** L(f) = β − 1/A into the slot. */
  readonly loopAt: (f: number, out: ComplexSlot) => void;
  /** β(f) into the slot. */
  readonly bridgeAt: (f: number, out: ComplexSlot) => void;
  /** Op-amp slew rate, V/s: the output's steps are held to it (a lag that lowers the frequency). */
  readonly slew: number;
}

/**
 * Hold one period (in place) to a slew rate in periodic steady state: three
 * passes, the last kept (as the gain stages do). The lag this adds to the
 * fundamental is what pulls a slew-bound oscillator's frequency down.
 */
function slewPeriod(y: Float64Array, f: number, slew: number, scratch: Float64Array): void {
  const m = y.length;
  const step = slew / (f * m);
  let steepest = 0;
  for (let i = 0; i < m; i++) steepest = Math.max(steepest, Math.abs((y[i] as number) - (y[(i + m - 1) % m] as number)));
  if (steepest <= step) return;
  scratch.set(y);
  let x = y[0] as number;
  for (let pass = 0; pass < 3; pass++) {
    for (let i = 0; i < m; i++) {
      const d = (scratch[i] as number) - x;
      x = d > step ? x + step : d < -step ? x - step : (scratch[i] as number);
      if (pass === 2) y[i] = x;
    }
  }
}

export interface BalanceResult {
  readonly f: number;
  /** Amplitude of the fundamental at the (+) input, V. */
  readonly a: number;
  /** Harmonics at the (+) input relative to a, phasors, k = 2 … m/2 − 1 (re at 2k, im at 2k+1). */
  readonly harmonics: Float64Array;
  /** False when the rounds ran out or the solution wandered off (a slew-bound extreme): use the start. */
  readonly converged: boolean;
}

const tableCache = new Map<number, { cos: Float64Array; sin: Float64Array }>();

/** cos and sin of 2π·j/m for j = 0 … m − 1: every harmonic's angle is an index (k·i) mod m. */
function tables(m: number): { cos: Float64Array; sin: Float64Array } {
  let t = tableCache.get(m);
  if (!t) {
    const cos = new Float64Array(m);
    const sin = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      cos[j] = Math.cos((2 * Math.PI * j) / m);
      sin[j] = Math.sin((2 * Math.PI * j) / m);
    }
    t = { cos, sin };
    tableCache.set(m, t);
  }
  return t;
}

/** One period of V⁺ (m samples) from a and the harmonic phasors relative to a (those above m/2 − 1 ignored). */
function fillInput(v: Float64Array, a: number, harmonics: Float64Array): void {
  const m = v.length;
  const { cos, sin } = tables(m);
  const top = Math.min(m / 2 - 1, harmonics.length / 2 - 1);
  for (let i = 0; i < m; i++) v[i] = sin[i] as number;
  for (let k = 2; k <= top; k++) {
    const hr = harmonics[2 * k] as number;
    const hi = harmonics[2 * k + 1] as number;
    if (hr === 0 && hi === 0) continue;
    // j = k·i mod m, stepped instead of divided (the same table entries, the same sums).
    for (let i = 0, j = 0; i < m; i++, j = j + k >= m ? j + k - m : j + k) {
      v[i] = (v[i] as number) + hr * (cos[j] as number) - hi * (sin[j] as number);
    }
  }
  for (let i = 0; i < m; i++) v[i] = a * (v[i] as number);
}

/** Phasor of harmonic k of one period into the slot. */
function phasor(x: Float64Array, k: number, out: ComplexSlot): void {
  const m = x.length;
  const { cos, sin } = tables(m);
  let re = 0;
  let im = 0;
  for (let i = 0, j = 0; i < m; i++, j = j + k >= m ? j + k - m : j + k) {
    re += (x[i] as number) * (cos[j] as number);
    im -= (x[i] as number) * (sin[j] as number);
  }
  out.re = (2 * re) / m;
  out.im = (2 * im) / m;
}

export function balance(p: BalanceProblem, f: number, a: number, m: number, rounds: number, rtol: number): BalanceResult {
  const harmonics = new Float64Array(m);
  const v = new Float64Array(m);
  const y = new Float64Array(m);
  const slot: ComplexSlot = { re: 0, im: 0 };
  const l: ComplexSlot = { re: 0, im: 0 };
  // N = OUT₁ / V⁺₁ for an amplitude, with the harmonics as they stand.
  const scratch = new Float64Array(m);
  const describing = (amp: number, out: ComplexSlot) => {
    fillInput(v, amp, harmonics);
    for (let i = 0; i < m; i++) y[i] = p.shape(v[i] as number);
    slewPeriod(y, f, p.slew, scratch);
    phasor(y, 1, slot);
    // Divide by −j·amp: (re + j·im)/(−j·amp) = (−im + j·re)/amp.
    out.re = -slot.im / amp;
    out.im = slot.re / amp;
  };
  const n: ComplexSlot = { re: 0, im: 0 };
  const f1 = f;
  let converged = false;
  let step = 1;
  let lastChange = Number.POSITIVE_INFINITY;
  for (let round = 0; round < rounds; round++) {
    const fBefore = f;
    const aBefore = a;
    describing(a, n);
    // Phase: Im(N·L(f)) = 0 near the present f.
    const phase = (x: number) => {
      p.loopAt(x, l);
      return n.re * l.im + n.im * l.re;
    };
    let lo = f / 1.05;
    let hi = f * 1.05;
    for (let k = 0; k < 3 && phase(lo) * phase(hi) > 0; k++) {
      lo /= 1.2;
      hi *= 1.2;
    }
    const fNew = findRoot(phase, lo, hi, rtol);
    if (Number.isFinite(fNew)) f = fNew;
    p.loopAt(f, l);
    const lmag = Math.hypot(l.re, l.im);
    // Magnitude: |N(a)|·|L| = 1, the harmonics held in proportion to a.
    const magnitude = (x: number) => {
      describing(x, n);
      return Math.hypot(n.re, n.im) * lmag - 1;
    };
    // Secant from the present amplitude (it moves little between rounds); a bracket if that strays.
    let x0 = a;
    let m0 = magnitude(x0);
    let x1 = a * (m0 > 0 ? 1.01 : 0.99);
    let aNew = Number.NaN;
    for (let k = 0; k < 8; k++) {
      const m1 = magnitude(x1);
      if (m1 === m0) break;
      const x2 = x1 - (m1 * (x1 - x0)) / (m1 - m0);
      if (!(x2 > x1 / 2 && x2 < x1 * 2)) break;
      x0 = x1;
      m0 = m1;
      x1 = x2;
      if (Math.abs(x1 / x0 - 1) < rtol) {
        aNew = x1;
        break;
      }
    }
    if (!Number.isFinite(aNew)) {
      let alo = a / 1.1;
      let ahi = a * 1.1;
      for (let k = 0; k < 30 && magnitude(alo) * magnitude(ahi) > 0; k++) {
        alo /= 1.5;
        ahi *= 1.5;
      }
      aNew = findRoot(magnitude, alo, ahi, rtol);
    }
    if (Number.isFinite(aNew)) a = aNew;
    // Harmonics at the (+) input from the output's, through the bridge. A plain substitution
    // V⁺ₖ = β(kω)·OUTₖ converges only as fast as |β(kω)|·G (about 0.75 for the third);
    // splitting OUTₖ = G·V⁺ₖ + Sₖ, with G the path's describing gain, and solving
    // V⁺ₖ = β·(G·V⁺ₖ + Sₖ) for V⁺ₖ = β·Sₖ/(1 − β·G) converges in a few rounds.
    fillInput(v, a, harmonics);
    for (let i = 0; i < m; i++) y[i] = p.shape(v[i] as number);
    slewPeriod(y, f, p.slew, scratch);
    phasor(y, 1, slot);
    const g = Math.hypot(slot.re, slot.im) / a;
    let change = Math.max(Math.abs(f / fBefore - 1), Math.abs(a / aBefore - 1));
    for (let k = 2; k < m / 2; k++) {
      phasor(y, k, slot);
      const sr = slot.re - g * a * (harmonics[2 * k] as number);
      const si = slot.im - g * a * (harmonics[2 * k + 1] as number);
      p.bridgeAt(k * f, slot);
      const br = slot.re;
      const bi = slot.im;
      // β·S / (1 − β·G)
      const nr = br * sr - bi * si;
      const ni = br * si + bi * sr;
      const dr = 1 - g * br;
      const di = -g * bi;
      const d = dr * dr + di * di;
      const hr = (nr * dr + ni * di) / d / a;
      const hi = (ni * dr - nr * di) / d / a;
      change = Math.max(change, Math.abs(hr - (harmonics[2 * k] as number)), Math.abs(hi - (harmonics[2 * k + 1] as number)));
      // Half steps once a round fails to shrink the change: the slew limiter makes the map rough
      // on a sampled period, and full steps can cycle there.
      harmonics[2 * k] = (harmonics[2 * k] as number) + step * (hr - (harmonics[2 * k] as number));
      harmonics[2 * k + 1] = (harmonics[2 * k + 1] as number) + step * (hi - (harmonics[2 * k + 1] as number));
    }
    if (change > lastChange) step = Math.max(0.2, step * 0.6);
    lastChange = change;
    if (!(f > f1 / 2 && f < f1 * 2 && a > 0)) break;
    if (change < 10 * rtol) {
      converged = true;
      break;
    }
  }
  return { f, a, harmonics, converged };
}

/** One period of the output at `out.length` points for a balanced solution. */
export function balancedOutput(p: BalanceProblem, r: BalanceResult, out: Float64Array): void {
  const v = new Float64Array(out.length);
  fillInput(v, r.a, r.harmonics);
  for (let i = 0; i < out.length; i++) out[i] = p.shape(v[i] as number);
}
