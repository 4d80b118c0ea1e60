import type { Complex } from './types.js';

/**
 * Small complex helpers for impedances (ohms, re + j·im). An open circuit is
 * `open` (infinite real part); the helpers keep it open instead of making NaN.
 */
export const open: Complex = Object.freeze({ re: Number.POSITIVE_INFINITY, im: 0 });

export function isOpen(z: Complex): boolean {
  return !Number.isFinite(z.re) || !Number.isFinite(z.im);
}

export function resistance(r: number): Complex {
  return { re: r, im: 0 };
}

/** A capacitor's impedance 1/(j·2π·f·C); open at DC. */
export function capacitor(c: number, f: number): Complex {
  if (!(f > 0)) return open;
  return { re: 0, im: -1 / (2 * Math.PI * f * c) };
}

export function add(a: Complex, b: Complex): Complex {
  if (isOpen(a) || isOpen(b)) return open;
  return { re: a.re + b.re, im: a.im + b.im };
}

/** a ‖ b: ab/(a + b); an open side leaves the other. */
export function parallel(a: Complex, b: Complex | undefined): Complex {
  if (b === undefined || isOpen(b)) return a;
  if (isOpen(a)) return b;
  // 1/(1/a + 1/b), through admittances so a zero impedance stays a short.
  const ya = invert(a);
  const yb = invert(b);
  return invert({ re: ya.re + yb.re, im: ya.im + yb.im });
}

/** 1/z (an open becomes 0, a short becomes open). */
export function invert(z: Complex): Complex {
  if (isOpen(z)) return { re: 0, im: 0 };
  const d = z.re * z.re + z.im * z.im;
  if (d === 0) return open;
  return { re: z.re / d, im: -z.im / d };
}

/** a / b. */
export function divide(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

/**
 * The voltage divider a load makes with a source impedance: zl/(zs + zl), the
 * part of the open-circuit voltage that reaches the loaded node. No load: 1.
 */
export function loadedShare(zs: Complex, zl: Complex | undefined): Complex {
  if (zl === undefined || isOpen(zl)) return { re: 1, im: 0 };
  if (isOpen(zs)) return { re: 0, im: 0 };
  return divide(zl, { re: zs.re + zl.re, im: zs.im + zl.im });
}
