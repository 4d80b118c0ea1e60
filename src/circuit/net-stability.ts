import type { LinearNet } from './linear-net.js';
import type { OpampModel } from './types.js';

/** What a section does on its own, with no signal: settle, oscillate, or run to a rail. */
export type NetStability = 'stable' | 'oscillates' | 'latches';

export interface NetBehaviour {
  readonly kind: NetStability;
  /** For an oscillation: the growing pair's frequency at onset, Hz (the rails then pull it somewhat). */
  readonly frequency: number;
}

const points = 8;

/**
 * The natural behaviour of a net with the one-pole op-amp. Every entry of the
 * nodal matrix is of first degree in s (G + sC, and 1/A = 1/aol + s/(2π·GBW)
 * in the op-amp's row), so its determinant is a polynomial in s of degree at
 * most the node count; its zeros are the natural frequencies. The polynomial
 * is recovered exactly from the determinant at eight points on a circle of
 * radius `rho` (rad/s, near the section's own frequency, which keeps the
 * coefficients of z = s/rho of similar size), by a discrete Fourier transform,
 * and tested with the Routh–Hurwitz criterion (any control-systems text):
 * all roots in the left half-plane means stable. A constant term of the wrong
 * sign (the DC equilibrium itself unstable: positive feedback that holds at
 * DC) means the output runs to a rail and stays there; any other instability
 * swings between the rails, sine-like from a growing complex pair, as a
 * relaxation from real roots (checked against ngspice transients in
 * test/circuit/net-stability.test.ts). The roots (Durand–Kerner iteration)
 * give the rate at onset.
 */
export function netStability(net: LinearNet, op: OpampModel | undefined, rho: number): NetBehaviour {
  const re = new Float64Array(points);
  const im = new Float64Array(points);
  const slot = { re: 0, im: 0 };
  for (let k = 0; k < points; k++) {
    const a = (2 * Math.PI * k) / points;
    net.determinant(rho * Math.cos(a), rho * Math.sin(a), op, slot);
    re[k] = slot.re;
    im[k] = slot.im;
  }
  const d: number[] = [];
  let largest = 0;
  for (let j = 0; j < points; j++) {
    let c = 0;
    for (let k = 0; k < points; k++) {
      const a = (2 * Math.PI * j * k) / points;
      c += (re[k] as number) * Math.cos(a) + (im[k] as number) * Math.sin(a);
    }
    d.push(c / points);
    largest = Math.max(largest, Math.abs(c / points));
  }
  const stable: NetBehaviour = { kind: 'stable', frequency: Number.NaN };
  if (!(largest > 0) || !Number.isFinite(largest)) return stable;
  const floor = 1e-10 * largest;
  let degree = points - 1;
  while (degree > 0 && Math.abs(d[degree] as number) <= floor) degree--;
  const sign = (d[degree] as number) < 0 ? -1 : 1;
  const c = d.slice(0, degree + 1).map((x) => (Math.abs(x) <= floor ? 0 : sign * x));
  if (degree === 0) return stable;
  if ((c[0] as number) <= 0) return { kind: 'latches', frequency: Number.NaN };
  if (routhStable(c)) return stable;
  const roots = polynomialRoots(c);
  let worst = roots[0] ?? { re: 0, im: 0 };
  for (const r of roots) if (r.re > worst.re) worst = r;
  // Unstable but with a stable DC equilibrium: a growing pair swings sine-like into the rails;
  // real right-half-plane roots give a relaxation between the rails (a capacitor in the loop
  // lets the saturated state decay and flip) at a rate of about the root itself.
  const turning = Math.abs(worst.im) > 0.1 * worst.re ? Math.abs(worst.im) : worst.re;
  return { kind: 'oscillates', frequency: (turning * rho) / (2 * Math.PI) };
}

/** Every root of c[0] + c[1]·z + … + c[n]·zⁿ by the Durand–Kerner (Weierstrass) iteration. */
export function polynomialRoots(c: readonly number[]): { re: number; im: number }[] {
  const n = c.length - 1;
  const lead = c[n] as number;
  const a = c.map((x) => x / lead);
  const zr: number[] = [];
  const zi: number[] = [];
  for (let k = 0; k < n; k++) {
    // The customary start: powers of 0.4 + 0.9j, neither real nor on the unit circle's symmetries.
    const mag = Math.hypot(0.4, 0.9) ** k;
    const ang = k * Math.atan2(0.9, 0.4);
    zr.push(mag * Math.cos(ang));
    zi.push(mag * Math.sin(ang));
  }
  for (let it = 0; it < 500; it++) {
    let moved = 0;
    for (let k = 0; k < n; k++) {
      // p(z) by Horner, and the product of (z − z_j) over j ≠ k.
      let pr = 1;
      let pi = 0;
      for (let j = n - 1; j >= 0; j--) {
        const r = pr * (zr[k] as number) - pi * (zi[k] as number) + (a[j] as number);
        pi = pr * (zi[k] as number) + pi * (zr[k] as number);
        pr = r;
      }
      let qr = 1;
      let qi = 0;
      for (let j = 0; j < n; j++) {
        if (j === k) continue;
        const dr = (zr[k] as number) - (zr[j] as number);
        const di = (zi[k] as number) - (zi[j] as number);
        const r = qr * dr - qi * di;
        qi = qr * di + qi * dr;
        qr = r;
      }
      const q = qr * qr + qi * qi;
      if (q === 0) continue;
      const sr = (pr * qr + pi * qi) / q;
      const si = (pi * qr - pr * qi) / q;
      zr[k] = (zr[k] as number) - sr;
      zi[k] = (zi[k] as number) - si;
      moved = Math.max(moved, Math.hypot(sr, si) / (1 + Math.hypot(zr[k] as number, zi[k] as number)));
    }
    if (moved < 1e-14) break;
  }
  return zr.map((r, k) => ({ re: r, im: zi[k] as number }));
}

/** Routh–Hurwitz: true when every root of c[0] + c[1]·z + … + c[n]·zⁿ (c[n] > 0) lies in the left half-plane. */
export function routhStable(c: readonly number[]): boolean {
  const n = c.length - 1;
  if (n <= 0) return true;
  if (c.some((x) => !(x > 0))) return false;
  // Rows from the highest power: [c_n, c_{n−2}, …] and [c_{n−1}, c_{n−3}, …].
  let upper: number[] = [];
  let lower: number[] = [];
  for (let j = n; j >= 0; j -= 2) upper.push(c[j] as number);
  for (let j = n - 1; j >= 0; j -= 2) lower.push(c[j] as number);
  for (let row = 0; row < n - 1; row++) {
    const pivot = lower[0] ?? 0;
    if (!(pivot > 0)) return false;
    const next: number[] = [];
    for (let j = 0; j + 1 < upper.length; j++)
      next.push(((lower[0] as number) * (upper[j + 1] as number) - (upper[0] as number) * (lower[j + 1] ?? 0)) / pivot);
    upper = lower;
    lower = next.length > 0 ? next : [0];
  }
  return (lower[0] ?? 0) > 0 || n === 1;
}
