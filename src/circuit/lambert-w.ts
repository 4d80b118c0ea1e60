import { hermiteCoefficients } from './hermite-knots.js';

/**
 * Lambert's W of e^L on its principal branch: the root w > 0 of w + ln w = L
 * (w·e^w = e^L). A diode string in series with a resistor has an explicit
 * current through it (see `stringCurrentAt`), so a node of such branches can be
 * solved without solving every junction: the shaper's Monte Carlo trials do.
 *
 * Between L = −40 and L = 64 the value comes from a table (cubic Hermite
 * with the exact slope dw/dL = w/(1 + w), 8 intervals per unit of L): within
 * 6e-7 of w where w ≈ e^L, 3e-9 where w > 1 (the tests check it against the
 * lambert-w-function package from the registry). Above, two Newton steps on
 * w + ln w = L from the asymptotic start L − ln L + ln L / L (the first terms of
 * W's asymptotic series, Corless et al. 1996; from memory) settle it to
 * rounding. Below, w < e^−40 (4e-18): 0.
 *
 * Measured against computing it each time (bench/diode-shaper.bench.ts, 512 values):
 * the table 4.5 µs, the lambert-w-function package 111 µs, our Newton steps 147 µs;
 * hence hand-written, with the package as the tests' reference.
 */
export const tableFirst = -40;
export const tableLast = 64;
export const tablePerUnit = 8;
export const tableIntervals = (tableLast - tableFirst) * tablePerUnit;
const perUnit = tablePerUnit;
const intervals = tableIntervals;

/** Power-series coefficients of each interval in t ∈ [0, 1): w = c0 + t·(c1 + t·(c2 + t·c3)). Built on first use. */
let coefficients: Float64Array | undefined;

/** w + ln w = L by Newton's method in the logarithmic form w ← w·(1 + L − ln w)/(1 + w), from a close start; to rounding. */
export function lambertWOfExp(L: number): number {
  if (!Number.isFinite(L)) return L > 0 ? L : Number.isNaN(L) ? L : 0;
  let w = L < 1 ? Math.exp(L) : L - Math.log(L) + Math.log(L) / L;
  for (let i = 0; i < 60; i++) {
    const next = (w * (1 + L - Math.log(w))) / (1 + w);
    if (Math.abs(next - w) <= 4e-16 * next) return next;
    w = next;
  }
  return w;
}

/** The table (built once, about 30 kB): 4 coefficients per interval. */
export function lambertTable(): Float64Array {
  if (coefficients) return coefficients;
  const h = 1 / perUnit;
  // At each knot w and its exact slope dw/dL = w/(1 + w), then cubic Hermite between them.
  const w = new Float64Array(intervals + 1);
  const slope = new Float64Array(intervals + 1);
  for (let j = 0; j <= intervals; j++) {
    const wj = lambertWOfExp(tableFirst + j * h);
    w[j] = wj;
    slope[j] = wj / (1 + wj);
  }
  const c = new Float64Array(4 * intervals);
  hermiteCoefficients(w, slope, h, intervals, c);
  coefficients = c;
  return c;
}

/**
 * w(L) from the table `c` (from `lambertTable`), Newton above it, 0 below.
 * Plain function over a passed table so that a hot loop inlines it.
 */
export function lambertFromTable(c: Float64Array, L: number): number {
  const u = (L - tableFirst) * perUnit;
  if (u >= 0 && u < intervals) {
    const j = u | 0;
    const t = u - j;
    const k = j << 2;
    return (c[k] as number) + t * ((c[k + 1] as number) + t * ((c[k + 2] as number) + t * (c[k + 3] as number)));
  }
  if (!(u >= 0)) return 0;
  return lambertBeyond(L);
}

/** Above the table: two Newton steps from the asymptotic start settle w to rounding for L ≥ 64. */
function lambertBeyond(L: number): number {
  const ln = Math.log(L);
  let w = L - ln + ln / L;
  w = (w * (1 + L - Math.log(w))) / (1 + w);
  w = (w * (1 + L - Math.log(w))) / (1 + w);
  return w;
}
