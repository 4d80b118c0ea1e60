import { type DiodeModel, thermalVoltage } from './diode.js';

/**
 * The non-inverting gain path of a Wien-bridge oscillator as a static
 * non-linearity from the (+) input to the output: with the op-amp's loop
 * closed, V(−) follows V(+) = v, so Rg carries i = v/Rg, which also flows
 * through Rf1 and through Rf2 with its two antiparallel diodes; the output is
 * v + i·Rf1 + vD(i), held by the op-amp's gain and then by its swing.
 * vD(i) solves i = vD/Rf2 + Is·(e^(Vj/(n·Vt)) − 1) − Is·(1 − e^(−vD/(n·Vt))),
 * vD = Vj + Id·RS (Shockley law with series resistance, see diode.ts; the
 * reverse diode's current never exceeds Is, so its RS is left out and its
 * exponential is replaced by a rational form with the same slope and ceiling).
 */
export interface WienGainPath {
  /** Ω; an open part is 1e15 Ω, a shorted one 1 mΩ. */
  readonly rg: number;
  readonly rf1: number;
  /** Ω; Infinity without Rf2 (then there are no diodes either). */
  readonly rf2: number;
  /** The diode pair across Rf2, or undefined when there is none (or it is open). */
  readonly diode: DiodeModel | undefined;
  /** Op-amp DC gain: the path never amplifies more than that. */
  readonly aol: number;
  readonly high: number;
  readonly low: number;
}

/**
 * Voltage across Rf2 ∥ diodes at a current i (odd in i). Solved for the diode
 * current Id: the junction then drops Vj = n·Vt·ln(1 + Id/Is), and the residual
 * (Vj + Id·RS)/Rf2 + Id + reverse − i is increasing and concave in Id, so
 * Newton from below (from 0, or from the previous sample's Id, `hint`) climbs
 * to the root without overshooting; an iterate past it drops back to 0 at worst.
 */
export function limiterVoltage(p: WienGainPath, i: number, nvt: number, hint = Number.NaN): number {
  if (i <= 0) return i < 0 ? -limiterVoltage(p, -i, nvt, hint) : 0;
  if (!p.diode) return Number.isFinite(p.rf2) ? i * p.rf2 : 0;
  const { is, rs } = p.diode;
  const g2 = Number.isFinite(p.rf2) ? 1 / p.rf2 : 0;
  let id = hint >= 0 && hint < i ? hint : 0;
  for (let k = 0; k < 100; k++) {
    const vd = nvt * Math.log1p(id / is) + id * rs;
    // The reverse diode passes at most Is (nA): a rational form with its zero-bias
    // conductance Is/(n·Vt) and that ceiling stands in for Is·(1 − e^(−vD/nVt)), within Is/4.
    const reverse = (is * vd) / (nvt + vd);
    const r = vd * g2 + id + reverse - i;
    const slope = (nvt / (is + id) + rs) * g2 + 1;
    const next = Math.max(0, Math.min(i, id - r / slope));
    const step = next - id;
    id = next;
    if (Math.abs(step) <= 1e-12 * id + 1e-21) break;
  }
  lastCurrent = id;
  return nvt * Math.log1p(id / is) + id * rs;
}

/** Diode current of the last `limiterVoltage` solve, the next sample's starting point. */
let lastCurrent = 0;

/** Output for a (+)-input voltage v ≥ 0 before the swing: the gain path, capped at the op-amp's own gain. */
function pathUnclipped(p: WienGainPath, v: number, nvt: number, hint: number): number {
  const i = v / p.rg;
  let out = v + i * p.rf1 + limiterVoltage(p, i, nvt, hint);
  const cap = p.aol * Math.abs(v);
  if (Math.abs(out) > cap) out = Math.sign(out) * cap;
  return out;
}

/** Output for a (+)-input voltage v: the gain path, capped at the op-amp's own gain, then clipped at its swing. */
export function pathOutput(p: WienGainPath, v: number, nvt: number): number {
  const out = v < 0 ? -pathUnclipped(p, -v, nvt, Number.NaN) : pathUnclipped(p, v, nvt, Number.NaN);
  return Math.min(p.high, Math.max(p.low, out));
}

/** Small-signal gain of the path at v → 0 (diodes at their zero-bias resistance n·Vt/Is each). */
export function smallSignalGain(p: WienGainPath, nvt = thermalVoltage() * (p.diode?.n ?? 1)): number {
  let rd = Number.isFinite(p.rf2) ? p.rf2 : Number.POSITIVE_INFINITY;
  if (p.diode) {
    const pair = nvt / (2 * p.diode.is);
    rd = Number.isFinite(rd) ? (rd * pair) / (rd + pair) : pair;
  }
  return Math.min(1 + (p.rf1 + rd) / p.rg, p.aol);
}

/**
 * One period of the output for a sine of amplitude `vp` at the (+) input
 * (`samples` long, starting at the rising zero crossing), and its fundamental
 * amplitude (DFT bin 1: the describing function times vp). The waveform is
 * computed on a quarter period and mirrored: the path is odd and a sine is
 * symmetric about its peak.
 */
export function pathWave(shape: (v: number) => number, vp: number, out: Float64Array): number {
  const n = out.length;
  const quarter = n / 4;
  for (let k = 0; k <= quarter; k++) {
    const s = Math.sin((2 * Math.PI * k) / n);
    const hi = shape(vp * s);
    const lo = shape(-vp * s);
    out[k] = hi;
    if (k > 0 && k < quarter) out[n / 2 - k] = hi;
    if (k < n / 2) out[(n / 2 + k) % n] = lo;
    if (k > 0 && k < quarter) out[n - k] = lo;
  }
  let b1 = 0;
  for (let k = 0; k < n; k++) b1 += (out[k] as number) * Math.sin((2 * Math.PI * k) / n);
  return (2 * b1) / n;
}

/**
 * The gain path as a table, for the hundreds of evaluations one oscillator
 * solve makes. With the diode current as the parameter, every point is
 * explicit (no Newton): Vj on a uniform grid (fine through the knee), Id =
 * Is·(e^(Vj/nVt) − 1), vD = Vj + Id·RS, i = vD/Rf2 + Id + reverse, v = i·Rg,
 * out = v + i·Rf1 + vD, and the exact slope d(out)/dv = 1 + (Rf1 + dvD/di)/Rg.
 * Between points, cubic Hermite interpolation with those slopes; the grid
 * reaches v = vmax, and beyond it the path continues on its last slope. The
 * op-amp's gain cap and swing are applied after. Tested against the Newton
 * solve (`pathOutput`) in test/circuit/wien-bridge.test.ts.
 */
export function pathFunction(p: WienGainPath, nvt: number, vmax: number, points = 257): (v: number) => number {
  const clip = (v: number, y: number) => {
    const cap = p.aol * Math.abs(v);
    const capped = Math.abs(y) > cap ? Math.sign(y) * cap : y;
    return Math.min(p.high, Math.max(p.low, capped));
  };
  if (!p.diode) {
    const slope = 1 + (p.rf1 + (Number.isFinite(p.rf2) ? p.rf2 : 0)) / p.rg;
    return (v) => clip(v, v * slope);
  }
  const { is, rs } = p.diode;
  const g2 = Number.isFinite(p.rf2) ? 1 / p.rf2 : 0;
  limiterVoltage(p, vmax / p.rg, nvt);
  const vjMax = nvt * Math.log1p(lastCurrent / is) * 1.001 + 1e-9;
  const vs = new Float64Array(points);
  const ys = new Float64Array(points);
  const ds = new Float64Array(points);
  for (let k = 0; k < points; k++) {
    const vj = (vjMax * k) / (points - 1);
    const id = is * Math.expm1(vj / nvt);
    const vd = vj + id * rs;
    const reverse = (is * vd) / (nvt + vd);
    const i = vd * g2 + id + reverse;
    // dvD/di: the diode's incremental resistance n·Vt/(Is + Id) plus RS, with Rf2 and the reverse diode alongside.
    const rd = nvt / (is + id) + rs;
    const dRev = (is * nvt) / ((nvt + vd) * (nvt + vd));
    const dvdi = 1 / (g2 + 1 / rd + dRev);
    vs[k] = i * p.rg;
    ys[k] = i * p.rg + i * p.rf1 + vd;
    ds[k] = 1 + (p.rf1 + dvdi) / p.rg;
  }
  const last = points - 1;
  const unclipped = (x: number): number => {
    if (x >= (vs[last] as number)) return (ys[last] as number) + (ds[last] as number) * (x - (vs[last] as number));
    let lo = 0;
    let hi = last;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if ((vs[mid] as number) <= x) lo = mid;
      else hi = mid;
    }
    const x0 = vs[lo] as number;
    const h = (vs[hi] as number) - x0;
    const t = (x - x0) / h;
    const t2 = t * t;
    const t3 = t2 * t;
    return (
      (2 * t3 - 3 * t2 + 1) * (ys[lo] as number) +
      (t3 - 2 * t2 + t) * h * (ds[lo] as number) +
      (-2 * t3 + 3 * t2) * (ys[hi] as number) +
      (t3 - t2) * h * (ds[hi] as number)
    );
  };
  return (v) => clip(v, v < 0 ? -unclipped(-v) : unclipped(v));
}
