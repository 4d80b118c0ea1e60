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
}

export interface BalanceResult {
  readonly f: number;
  /** Amplitude of the fundamental at the (+) input, V. */
  readonly a: number;
  /** Harmonics at the (+) input relative to a, phasors, k = 2 … m/2 − 1 (re at 2k, im at 2k+1). */
  readonly harmonics: Float64Array;
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
    for (let i = 0; i < m; i++) {
      const j = (k * i) % m;
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
  for (let i = 0; i < m; i++) {
    const j = (k * i) % m;
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
  const describing = (amp: number, out: ComplexSlot) => {
    fillInput(v, amp, harmonics);
    for (let i = 0; i < m; i++) y[i] = p.shape(v[i] as number);
    phasor(y, 1, slot);
    // Divide by −j·amp: (re + j·im)/(−j·amp) = (−im + j·re)/amp.
    out.re = -slot.im / amp;
    out.im = slot.re / amp;
  };
  const n: ComplexSlot = { re: 0, im: 0 };
  for (let round = 0; round < rounds; round++) {
    describing(a, n);
    // Phase: Im(N·L(f)) = 0 near the present f.
    const phase = (x: number) => {
      p.loopAt(x, l);
      return n.re * l.im + n.im * l.re;
    };
    let lo = f / 1.05;
    let hi = f * 1.05;
    for (let k = 0; k < 20 && phase(lo) * phase(hi) > 0; k++) {
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
    let alo = a / 1.1;
    let ahi = a * 1.1;
    for (let k = 0; k < 30 && magnitude(alo) * magnitude(ahi) > 0; k++) {
      alo /= 1.5;
      ahi *= 1.5;
    }
    const aNew = findRoot(magnitude, alo, ahi, rtol);
    if (Number.isFinite(aNew)) a = aNew;
    // Harmonics at the (+) input from the output's, through the bridge.
    fillInput(v, a, harmonics);
    for (let i = 0; i < m; i++) y[i] = p.shape(v[i] as number);
    for (let k = 2; k < m / 2; k++) {
      phasor(y, k, slot);
      const or = slot.re;
      const oi = slot.im;
      p.bridgeAt(k * f, slot);
      harmonics[2 * k] = (slot.re * or - slot.im * oi) / a;
      harmonics[2 * k + 1] = (slot.re * oi + slot.im * or) / a;
    }
  }
  return { f, a, harmonics };
}

/** One period of the output at `out.length` points for a balanced solution. */
export function balancedOutput(p: BalanceProblem, r: BalanceResult, out: Float64Array): void {
  const v = new Float64Array(out.length);
  fillInput(v, r.a, r.harmonics);
  for (let i = 0; i < out.length; i++) out[i] = p.shape(v[i] as number);
}
