import { type DiodeString, junctionCeiling } from './diode.js';
import { solveKnots } from './shaper-knots.js';
import { hermiteCoefficients, interpolateKnots } from './hermite-knots.js';
import { extremes } from './waveform.js';

/**
 * The diode shaper's one node, in a form the solver can walk fast: `Rs` from the
 * input (conductance gs), an optional load to ground (gl, 0 when absent), and
 * branches, each a diode string (see diode.ts) from the node to its bias voltage,
 * conducting forward when sign·(v − bias) > 0 (sign +1 for a `+` branch, −1 for `-`).
 */
export interface ShaperNet {
  readonly gs: number;
  readonly gl: number;
  /**
   * Current fed into the node by linear branches to a bias (a branch whose one
   * diode is shorted is its resistor alone: its conductance is in `gl`, its
   * bias · conductance here), A. @default 0
   */
  readonly il?: number;
  readonly branches: readonly ShaperBranch[];
}

export interface ShaperBranch {
  readonly sign: 1 | -1;
  readonly bias: number;
  readonly diodes: DiodeString;
}

/**
 * Newton stops once its last step moved every voltage by less than 0.3 mV: the
 * convergence is quadratic (error after a step ≈ step² / (2·N·Vt) ≈ 11 V⁻¹ · step²
 * for the stiffest junction), so what is left is about 1 µV, three decades below
 * a bench reading. The tests hold the result to a bisection solve within 2 µV.
 */
const stepTolerance = 3e-4;
const maxNewton = 60;

/** Scratch arrays reused between calls (evaluation runs 10,000 times in a Monte Carlo). */
interface Scratch {
  readonly size: number;
  readonly sign: Float64Array;
  readonly bias: Float64Array;
  readonly is: Float64Array;
  readonly nvt: Float64Array;
  /** 1 / (N·Vt), 1/V. */
  readonly inv: Float64Array;
  readonly r: Float64Array;
  /** Junction voltages now and at the last three solved samples. */
  readonly x: Float64Array;
  readonly x1: Float64Array;
  readonly x2: Float64Array;
  readonly x3: Float64Array;
  readonly c: Float64Array;
  readonly res: Float64Array;
  /** Branch currents at the last Newton step, A. */
  readonly cur: Float64Array;
}

let scratch = makeScratch(8);

function makeScratch(size: number): Scratch {
  const a = (): Float64Array => new Float64Array(size);
  return { size, sign: a(), bias: a(), is: a(), nvt: a(), inv: a(), r: a(), x: a(), x1: a(), x2: a(), x3: a(), c: a(), res: a(), cur: a() };
}

/**
 * Solve the node voltage for the input samples at `order` (indices into `vin`),
 * writing `out[i]`. Newton's method on the node voltage and every branch's junction
 * voltage together (the Jacobian is an arrow, eliminated in O(branches)), started
 * from a quadratic extrapolation of the last three solved samples along the input
 * (or the transfer curve's slope), so a smooth drive settles in one or two steps
 * per sample. Junction steps are capped where the resistor alone would take all
 * the voltage, so exp never overflows; a sample that still does not settle falls
 * back to bisection. When `peaks` is given, peaks[b] becomes the highest forward
 * current branch b carried over these samples, A. When `slopes` is given,
 * slopes[i] becomes dv/dvin at each solved sample (from the last Newton step).
 * `tolerance` is the last step's size that counts as settled, V.
 * Returns the number of Newton steps taken (for benchmarks).
 */
export function solveNode(
  net: ShaperNet,
  vin: Float64Array,
  order: ArrayLike<number>,
  out: Float64Array,
  peaks?: Float64Array,
  slopes?: Float64Array,
  tolerance = stepTolerance,
): number {
  let steps = 0;
  if (peaks) peaks.fill(0);
  const k = net.branches.length;
  if (scratch.size < k) scratch = makeScratch(k);
  const { sign, bias, is, nvt, inv, r, x, x1, x2, x3, c, res, cur } = scratch;
  for (let b = 0; b < k; b++) {
    const br = net.branches[b] as ShaperBranch;
    sign[b] = br.sign;
    bias[b] = br.bias;
    is[b] = br.diodes.is;
    nvt[b] = br.diodes.nvt;
    inv[b] = 1 / br.diodes.nvt;
    r[b] = br.diodes.r;
  }
  const { gs, gl } = net;
  const il = net.il ?? 0;
  let v = 0;
  // The last three solved samples: inputs a1, a2, a3 (newest first) and node voltages.
  let a1 = 0,
    a2 = 0,
    a3 = 0,
    v1 = 0,
    v2 = 0,
    v3 = 0;
  let slope = 0;
  for (let j = 0; j < order.length; j++) {
    const idx = order[j] as number;
    const vi = vin[idx] as number;
    if (j === 0) {
      v = (vi * gs + il) / (gs + gl);
      for (let b = 0; b < k; b++) {
        x[b] = junctionCeiling(net.branches[b]!.diodes, sign[b]! * (v - bias[b]!));
      }
    } else {
      const d12 = a1 - a2,
        d13 = a1 - a3,
        d23 = a2 - a3;
      if (j >= 3 && d12 !== 0 && d13 !== 0 && d23 !== 0) {
        // Lagrange weights for extrapolating to vi from the last three samples.
        const w1 = ((vi - a2) * (vi - a3)) / (d12 * d13);
        const w2 = -((vi - a1) * (vi - a3)) / (d12 * d23);
        const w3 = ((vi - a1) * (vi - a2)) / (d13 * d23);
        v = w1 * v1 + w2 * v2 + w3 * v3;
        for (let b = 0; b < k; b++) x[b] = w1 * x1[b]! + w2 * x2[b]! + w3 * x3[b]!;
      } else {
        const dv = slope * (vi - a1);
        v = v1 + dv;
        for (let b = 0; b < k; b++) x[b] = x1[b]! + sign[b]! * c[b]! * dv;
      }
    }
    let settled = false;
    let den = gs + gl;
    for (let it = 0; it < maxNewton; it++) {
      steps++;
      let f = gs * (vi - v) - gl * v + il;
      den = gs + gl;
      let num = 0;
      for (let b = 0; b < k; b++) {
        const xb = x[b]!;
        const sb = sign[b]!;
        const isb = is[b]!;
        const rb = r[b]!;
        // Below −12·N·Vt the forward term IS·e^z is under 1e−5·IS (tens of fA for a
        // small-signal diode): the junction passes only −IS and needs no exp.
        const z = xb * inv[b]!;
        const e = z < -12 ? 0 : Math.exp(z);
        const current = isb * (e - 1);
        const gd = isb * e * inv[b]!;
        const cb = 1 / (1 + rb * gd);
        // Branch residual: junction plus resistor drop minus the voltage across the branch.
        const rr = xb + rb * current - sb * (v - bias[b]!);
        f -= sb * current;
        den += gd * cb;
        num += sb * gd * cb * rr;
        c[b] = cb;
        res[b] = rr;
        cur[b] = current;
      }
      const dv = (f + num) / den;
      v += dv;
      let worst = dv < 0 ? -dv : dv;
      for (let b = 0; b < k; b++) {
        const dx = (sign[b]! * dv - res[b]!) * c[b]!;
        let xn = x[b]! + dx;
        if (dx > 2 * nvt[b]!) xn = Math.min(xn, junctionCeiling(net.branches[b]!.diodes, sign[b]! * (v - bias[b]!)));
        // A junction step matters by the current it moves: weighted by 1 − c (0 for a
        // branch that is off, 1 for one that conducts hard).
        const step = (xn > x[b]! ? xn - x[b]! : x[b]! - xn) * (1 - c[b]!);
        if (step > worst) worst = step;
        x[b] = xn;
      }
      if (worst < tolerance && Number.isFinite(v)) {
        settled = true;
        break;
      }
    }
    if (!settled) {
      v = bisect(net, vi);
      for (let b = 0; b < k; b++) {
        const br = net.branches[b] as ShaperBranch;
        x[b] = branchJunction(br.diodes, br.sign * (v - br.bias));
        cur[b] = is[b]! * Math.expm1(x[b]! * inv[b]!);
        c[b] = 0;
      }
      den = Number.POSITIVE_INFINITY;
    }
    out[idx] = v;
    if (peaks) {
      // The currents of the last Newton step, one sub-0.3 mV step from the solution: close enough for a warning.
      for (let b = 0; b < k; b++) if (cur[b]! > peaks[b]!) peaks[b] = cur[b]!;
    }
    // dv/dvin at the solution: the input conductance over the node's total conductance.
    slope = Number.isFinite(den) ? gs / den : 0;
    if (slopes) slopes[idx] = slope;
    a3 = a2;
    a2 = a1;
    a1 = vi;
    v3 = v2;
    v2 = v1;
    v1 = v;
    for (let b = 0; b < k; b++) {
      x3[b] = x2[b]!;
      x2[b] = x1[b]!;
      x1[b] = x[b]!;
    }
  }
  return steps;
}

/**
 * A trial's transfer curve: the node is memoryless, so v depends on the input
 * level alone, whatever the waveform's shape (a triangle whose slopes differ
 * with the rails, a sine, a shaped wave). It is solved at knots spaced evenly
 * from the lowest to the highest input, `knotWidths` junction widths N·Vt apart
 * (the stiffest branch's) or closer (see `minIntervals`), walking upwards so every Newton start is a close
 * extrapolation; each sample then follows by cubic Hermite interpolation of
 * v(vin) with dv/dvin from the implicit function at the knots (gs over the
 * node's total conductance, which Newton already has). The extremes are knots,
 * so peaks and peak-to-peak are solved, not interpolated. Over the demo
 * shaper's tolerance box the samples sit within about 0.2 mV of the full solve
 * and its THD within 1e-5 (bench/diode-shaper.bench.ts prints both), far inside
 * the ngspice tolerances of the shaper's tests and a bench reading's uncertainty.
 */
const knotWidths = 3;
/**
 * Never fewer knot intervals than this: on random networks and drives (triangle and
 * sine, 0.05–30 V) a trial's samples then stay within 2e-4 of the output's swing and
 * its THD within 3e-5 of the full solve's; with fewer, a small sine drive lost its THD.
 */
const minIntervals = 32;

/**
 * A trial's knots settle as tightly as the full solve: a looser step (1 mV, about
 * 11 µV left) costs a small drive, whose whole output may be a few mV, most of its
 * THD's accuracy.
 */
const trialTolerance = stepTolerance;

let valueScratch = new Float64Array(0);
let slopeScratch = new Float64Array(0);
let walkScratch = new Int32Array(0);
let coefScratch = new Float64Array(0);

/**
 * As `solveNode` over every sample of `vin`, to bench accuracy (see `knotWidths`):
 * for Monte Carlo trials. Never uses more knots than there are samples.
 * Returns the number of Newton steps taken.
 */
export function solveTransfer(net: ShaperNet, vin: Float64Array, out: Float64Array): number {
  const n = vin.length;
  const { hi, lo } = extremes(vin);
  let width = Infinity;
  for (const br of net.branches) width = Math.min(width, br.diodes.nvt);
  const range = hi - lo;
  // At least `minIntervals`, so a small drive (nearly linear, nearly no distortion) keeps its THD too.
  const intervals = Math.min(n - 1, Math.max(minIntervals, Math.ceil(range / (knotWidths * width))));
  if (!(range > 0) || !(intervals >= 2) || !Number.isFinite(range)) {
    // No spread (DC, a latched upstream stage), too few samples, or NaN: solve every sample.
    if (walkScratch.length < n) walkScratch = new Int32Array(n);
    for (let i = 0; i < n; i++) walkScratch[i] = i;
    return solveNode(net, vin, walkScratch.subarray(0, n), out, undefined, undefined, trialTolerance);
  }
  const k = intervals + 1;
  if (valueScratch.length < k) {
    valueScratch = new Float64Array(k);
    slopeScratch = new Float64Array(k);
  }
  const h = range / intervals;
  const values = valueScratch;
  const slopes = slopeScratch;
  const steps = solveKnots(net, lo, hi, k, values, slopes, trialTolerance, bisect);
  // Cubic Hermite between knots, with dv/dvin from the solver.
  if (coefScratch.length < 4 * intervals) coefScratch = new Float64Array(4 * intervals);
  hermiteCoefficients(values, slopes, h, intervals, coefScratch);
  interpolateKnots(vin, lo, h, intervals, coefScratch, out);
  return steps;
}

/** Junction voltage of a string with `u` across it (Newton from above on a convex, rising function). */
export function branchJunction(d: DiodeString, u: number): number {
  let x = junctionCeiling(d, u);
  for (let it = 0; it < 200; it++) {
    const e = Math.exp(x / d.nvt);
    const h = x + d.r * d.is * (e - 1) - u;
    const dx = h / (1 + (d.r * d.is * e) / d.nvt);
    x -= dx;
    if (Math.abs(dx) < 1e-13) break;
  }
  return x;
}

/** Net current leaving the node at voltage v, A (falls as v rises: the root is unique). */
export function nodeCurrent(net: ShaperNet, vin: number, v: number): number {
  let f = net.gs * (vin - v) - net.gl * v + (net.il ?? 0);
  for (const br of net.branches) {
    const x = branchJunction(br.diodes, br.sign * (v - br.bias));
    f -= br.sign * br.diodes.is * Math.expm1(x / br.diodes.nvt);
  }
  return f;
}

/** The slow, sure way: bisection between limits the node cannot leave. */
function bisect(net: ShaperNet, vin: number): number {
  let lo = Math.min(vin, 0);
  let hi = Math.max(vin, 0);
  for (const br of net.branches) {
    lo = Math.min(lo, br.bias);
    hi = Math.max(hi, br.bias);
  }
  lo -= 1;
  hi += 1;
  for (let it = 0; it < 200 && hi - lo > 1e-12; it++) {
    const mid = 0.5 * (lo + hi);
    if (nodeCurrent(net, vin, mid) > 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
