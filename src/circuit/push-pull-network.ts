import { formatValue } from '../units/format.js';
import { defaultDiode, thermalVoltage } from './diode.js';
import { type FollowerNetwork, type FollowerState, deadband, freshState, isFromVbe, restState, solveFollower, trialTolerance } from './follower-network.js';
import { defaultHfe, defaultVbe, outputLoad, type PushPullSettings } from './push-pull.js';
import type { EvalInput, EvalOutput, StageWarning, Waveform } from './types.js';
import { hermiteCoefficients, interpolateKnots } from './hermite-knots.js';
import { extremes } from './waveform.js';

/**
 * The follower is memoryless (vin → vout): its transfer curve is solved at
 * knots spanning the drive and each sample follows by cubic Hermite
 * interpolation with dy/dvin from the solver (as the shaper's trials do); the
 * extremes are knots, so out.vpp is solved, not interpolated. Measured against
 * a solve per sample (sines of 2–10 V into 100 Ω … 8 kΩ, Rb 2k2 … 47k): within
 * 0.25 mV where the bias network feeds the bases, 0.25 % of the swing where a
 * starved diode turns off and leaves a corner; 20 intervals cost a third of 48.
 */
const intervals = 20;

/** A TO-92 transistor gets too hot to touch near half a watt (common practice, no source). */
const hotWatts = 0.5;

export function followerNetwork(input: EvalInput<PushPullSettings>, frequency: number): FollowerNetwork {
  const p = input.parts;
  const vt = thermalVoltage();
  const rl = outputLoad(input, frequency);
  return {
    vpos: input.supplies.pos,
    vneg: input.supplies.neg,
    rb1: p['Rb1'] ?? Number.NaN,
    rb2: p['Rb2'] ?? Number.NaN,
    gl: Number.isFinite(rl) ? 1 / rl : 0,
    diode: defaultDiode,
    // The plan's vbe is each transistor's drop at 1 mA collector current.
    isn: isFromVbe(p['vbe'] ?? defaultVbe, vt),
    isp: isFromVbe(p['vbe.pnp'] ?? p['vbe'] ?? defaultVbe, vt),
    betaN: p['hfe'] ?? defaultHfe,
    betaP: p['hfe.pnp'] ?? p['hfe'] ?? defaultHfe,
    vt,
  };
}

/** Copy the solution fields of `from` into `to` (no allocation on the hot path). */
function copyState(to: FollowerState, from: FollowerState): FollowerState {
  to.a = from.a;
  to.b = from.b;
  to.y = from.y;
  to.j1 = from.j1;
  to.j2 = from.j2;
  to.slope = from.slope;
  to.icn = from.icn;
  to.icp = from.icp;
  to.iin = from.iin;
  to.converged = from.converged;
  return to;
}

/**
 * Solve at `vin` into `s`, which holds a neighbour's solution at `fromVin`:
 * shifted along the curve first (the bases follow the drive, the output by its
 * slope), retried from scratch if Newton stalls.
 */
function solveAt(net: FollowerNetwork, vin: number, s: FollowerState, fromVin: number, tol: number | undefined): FollowerState {
  const d = vin - fromVin;
  s.a += d;
  s.b += d;
  s.y += s.slope * d;
  return solveFrom(net, vin, s, tol);
}

/** Newton from the start in `s`, retried from scratch if it stalls. */
function solveFrom(net: FollowerNetwork, vin: number, s: FollowerState, tol: number | undefined): FollowerState {
  solveFollower(net, vin, s, tol);
  return s.converged ? s : copyState(s, solveFollower(net, vin, freshState(vin), tol));
}

// Knot scratch, reused between trials (the engine evaluates 10,000 of them).
let ys = new Float64Array(intervals + 1);
let slopes = new Float64Array(intervals + 1);
let coef = new Float64Array(4 * intervals);
/** Each solved knot's unknowns (a, b, y, j1, j2 at 5·j), and whether it converged. */
let solved = new Float64Array(5 * (intervals + 1));
let known = new Uint8Array(intervals + 1);
const walk = freshState(0);
const middle = freshState(0);

/**
 * The start for knot j from the knots before it on its way out from the middle
 * (j − dir, j − 2·dir, j − 3·dir, evenly spaced): every unknown on the parabola
 * through three of them, or the line through two; false when fewer are solved.
 */
function extrapolate(s: FollowerState, j: number, dir: number, k: number): boolean {
  const p1 = j - dir;
  const p2 = j - 2 * dir;
  const p3 = j - 3 * dir;
  if (!isKnown(p1, k) || !isKnown(p2, k)) return false;
  // Newton's forward differences on an even grid (any numerical analysis text): 3·x1 − 3·x2 + x3, or 2·x1 − x2.
  const three = isKnown(p3, k);
  const w1 = three ? 3 : 2;
  const w2 = three ? -3 : -1;
  const w3 = three ? 1 : 0;
  const o1 = 5 * p1;
  const o2 = 5 * p2;
  const o3 = three ? 5 * p3 : o2;
  const v = solved;
  s.a = w1 * (v[o1] as number) + w2 * (v[o2] as number) + w3 * (v[o3] as number);
  s.b = w1 * (v[o1 + 1] as number) + w2 * (v[o2 + 1] as number) + w3 * (v[o3 + 1] as number);
  s.y = w1 * (v[o1 + 2] as number) + w2 * (v[o2 + 2] as number) + w3 * (v[o3 + 2] as number);
  s.j1 = w1 * (v[o1 + 3] as number) + w2 * (v[o2 + 3] as number) + w3 * (v[o3 + 3] as number);
  s.j2 = w1 * (v[o1 + 4] as number) + w2 * (v[o2 + 4] as number) + w3 * (v[o3 + 4] as number);
  s.slope = slopes[p1] as number;
  return true;
}

function isKnown(i: number, k: number): boolean {
  return i >= 0 && i <= k && known[i] === 1;
}

export function evaluateNetwork(input: EvalInput<PushPullSettings>, source: Waveform): EvalOutput {
  const net = followerNetwork(input, source.frequency);
  const samples = source.samples;
  const n = samples.length;
  const out = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  // A trial solves to bench accuracy (EvalInput.isTrial): a couple of µV left instead of nanovolts.
  const tol = input.isTrial ? trialTolerance : undefined;
  const zero = solveAt(net, 0, restState(net), 0, tol);
  const { hi: top, lo: bottom } = extremes(samples);
  const k = top > bottom ? intervals : 0;
  const h = k > 0 ? (top - bottom) / k : 0;
  if (ys.length < k + 1) {
    ys = new Float64Array(k + 1);
    slopes = new Float64Array(k + 1);
    coef = new Float64Array(4 * k);
    solved = new Float64Array(5 * (k + 1));
    known = new Uint8Array(k + 1);
  }
  known.fill(0);
  let ibase = 0;
  let starved = false;
  // Walk outwards from the knot nearest 0 V, each solve starting from the knots before it.
  const m = k > 0 ? Math.min(k, Math.max(0, Math.round(-bottom / h))) : 0;
  const s = copyState(walk, zero);
  for (let step = 0; step <= k; step++) {
    // Knots m, m+1 … k, then m−1 … 0 (restarting from knot m's solution).
    const up = step <= k - m;
    const j = up ? m + step : m - (step - (k - m));
    const x = j === k ? top : bottom + j * h;
    if (step === 0) solveAt(net, x, s, 0, tol);
    else if (extrapolate(s, j, up ? 1 : -1, k)) solveFrom(net, x, s, tol);
    else {
      // The first knot of the way down starts from the middle one.
      if (!up) copyState(s, middle);
      solveAt(net, x, s, up ? (j - 1 === k ? top : bottom + (j - 1) * h) : bottom + (j + 1) * h, tol);
    }
    if (step === 0) copyState(middle, s);
    if (s.converged) {
      const o = 5 * j;
      solved[o] = s.a;
      solved[o + 1] = s.b;
      solved[o + 2] = s.y;
      solved[o + 3] = s.j1;
      solved[o + 4] = s.j2;
      known[j] = 1;
    }
    ys[j] = s.converged ? s.y : Number.NaN;
    slopes[j] = s.slope;
    ibase = Math.max(ibase, s.icn / net.betaN, s.icp / net.betaP);
    // A bias diode carrying no forward current: Rb alone feeds that base (the drive is lost).
    if (s.j1 < 0.3 || s.j2 < 0.3) starved = true;
  }
  if (k === 0) out.fill(ys[0] as number);
  else {
    // Cubic Hermite between knots, with dy/dvin from the solver.
    hermiteCoefficients(ys, slopes, h, k, coef);
    interpolateKnots(samples, bottom, h, k, coef, out);
  }
  const { hi, lo } = extremes(out);
  const rload = input.settings.hasLoad ? (input.parts['Rload'] ?? Number.NaN) : Number.POSITIVE_INFINITY;
  const values: Record<string, number> = {
    'out.vpp': hi - lo,
    deadband: zero.converged ? deadband(net, zero) : Number.NaN,
    // Per transistor: the two collector currents differ only by the offset's load current.
    iq: zero.converged ? 0.5 * (zero.icn + zero.icp) : Number.NaN,
    // Below a nanovolt the offset is rounding, not a level (a matched pair sits at 0).
    'out.dc': zero.converged ? (Math.abs(zero.y) < 1e-9 ? 0 : zero.y) : Number.NaN,
  };
  if (input.settings.hasLoad) {
    values['out.ipeak'] = Math.max(Math.abs(hi), Math.abs(lo)) / rload;
    values['base.ipeak'] = ibase;
  }
  const warnings: StageWarning[] = [];
  if (input.isTrial) return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
  if (starved) {
    warnings.push({
      message: `at the drive's peaks a bias diode stops conducting: Rb1/Rb2 (${formatValue(net.rb1, 'Ω')}, ${formatValue(net.rb2, 'Ω')}) cannot feed the base current the load needs, so the output flattens; lower Rb or raise the load resistance`,
    });
  }
  if (zero.converged && 0.5 * (zero.icn + zero.icp) * (net.vpos - net.vneg) > hotWatts) {
    warnings.push({
      message: `the standing current ${formatValue(values['iq'] as number, 'A')} makes each transistor dissipate over ${formatValue(hotWatts, 'W')} with no signal: expect hot parts and possible thermal runaway; caution, do not touch`,
    });
  }
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
}
