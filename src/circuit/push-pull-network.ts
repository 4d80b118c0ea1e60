import { formatValue } from '../units/format.js';
import { defaultDiode, thermalVoltage } from './diode.js';
import { type FollowerNetwork, type FollowerState, deadband, freshState, isFromVbe, restState, solveFollower, trialTolerance } from './follower-network.js';
import { defaultHfe, defaultVbe, outputLoad, type PushPullSettings } from './push-pull.js';
import type { EvalInput, EvalOutput, StageWarning, Waveform } from './types.js';
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
 * slope; or, given the solution `behind` one knot further back, every unknown
 * along the line through the two), retried from scratch if Newton stalls.
 */
function solveAt(
  net: FollowerNetwork,
  vin: number,
  s: FollowerState,
  fromVin: number,
  tol: number | undefined,
  behind?: FollowerState,
  behindVin = fromVin,
): FollowerState {
  const d = vin - fromVin;
  if (behind && behindVin !== fromVin && behind.converged) {
    const r = d / (fromVin - behindVin);
    s.a += r * (s.a - behind.a);
    s.b += r * (s.b - behind.b);
    s.y += r * (s.y - behind.y);
    s.j1 += r * (s.j1 - behind.j1);
    s.j2 += r * (s.j2 - behind.j2);
  } else {
    s.a += d;
    s.b += d;
    s.y += s.slope * d;
  }
  solveFollower(net, vin, s, tol);
  return s.converged ? s : copyState(s, solveFollower(net, vin, freshState(vin), tol));
}

// Knot scratch, reused between trials (the engine evaluates 10,000 of them).
let ys = new Float64Array(intervals + 1);
let slopes = new Float64Array(intervals + 1);
let coef = new Float64Array(4 * intervals);
const walk = freshState(0);
const middle = freshState(0);
const lastKnot = freshState(0);
const knotBefore = freshState(0);

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
  }
  let ibase = 0;
  let starved = false;
  // Walk outwards from the knot nearest 0 V, each solve starting from its neighbour's.
  const m = k > 0 ? Math.min(k, Math.max(0, Math.round(-bottom / h))) : 0;
  const s = copyState(walk, zero);
  for (let step = 0; step <= k; step++) {
    // Knots m, m+1 … k, then m−1 … 0 (restarting from knot m's solution).
    const j = step <= k - m ? m + step : m - (step - (k - m));
    const x = j === k ? top : bottom + j * h;
    if (step === k - m + 1) copyState(s, middle);
    const from =
      step === 0 ? 0 : step === k - m + 1 ? (m === k ? top : bottom + m * h) : j > m ? (j - 1 === k ? top : bottom + (j - 1) * h) : bottom + (j + 1) * h;
    // From the second knot of each direction on, the start follows the last two knots.
    const along = step >= 2 && step !== k - m + 1;
    const behindVin = along ? (j > m ? (j - 2 === k ? top : bottom + (j - 2) * h) : bottom + (j + 2) * h) : from;
    if (along) copyState(knotBefore, lastKnot);
    copyState(lastKnot, s);
    solveAt(net, x, s, from, tol, along ? knotBefore : undefined, behindVin);
    if (step === 0) copyState(middle, s);
    ys[j] = s.converged ? s.y : Number.NaN;
    slopes[j] = s.slope;
    ibase = Math.max(ibase, s.icn / net.betaN, s.icp / net.betaP);
    // A bias diode carrying no forward current: Rb alone feeds that base (the drive is lost).
    if (s.j1 < 0.3 || s.j2 < 0.3) starved = true;
  }
  if (k === 0) out.fill(ys[0] as number);
  else {
    // Cubic Hermite between knots (any numerical analysis text), as power-series coefficients
    // in t ∈ [0, 1] per interval: y0 + m0·t + (3Δ − 2m0 − m1)·t² + (m0 + m1 − 2Δ)·t³.
    const c = coef;
    const y = ys;
    const dy = slopes;
    for (let j = 0; j < k; j++) {
      const y0 = y[j] as number;
      const d = (y[j + 1] as number) - y0;
      const m0 = h * (dy[j] as number);
      const m1 = h * (dy[j + 1] as number);
      c[4 * j] = y0;
      c[4 * j + 1] = m0;
      c[4 * j + 2] = 3 * d - 2 * m0 - m1;
      c[4 * j + 3] = m0 + m1 - 2 * d;
    }
    const scale = 1 / h;
    const last = k - 1;
    for (let i = 0; i < n; i++) {
      const u = ((samples[i] as number) - bottom) * scale;
      // u lies in [0, k] up to rounding: truncation is the floor there, and an integer index.
      let j = u | 0;
      if (j > last) j = last;
      else if (j < 0) j = 0;
      const t = u - j;
      const o = j << 2;
      out[i] = (c[o] as number) + t * ((c[o + 1] as number) + t * ((c[o + 2] as number) + t * (c[o + 3] as number)));
    }
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
