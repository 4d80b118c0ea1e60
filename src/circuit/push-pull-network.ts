import { formatValue } from '../units/format.js';
import { defaultDiode, thermalVoltage } from './diode.js';
import { type FollowerNetwork, type FollowerState, deadband, freshState, isFromVbe, solveFollower } from './follower-network.js';
import { defaultHfe, defaultVbe, outputLoad, type PushPullSettings } from './push-pull.js';
import type { EvalInput, EvalOutput, StageWarning, Waveform } from './types.js';
import { extremes } from './waveform.js';

/**
 * The follower is memoryless (vin → vout): its transfer curve is solved at
 * knots spanning the drive and each sample follows by cubic Hermite
 * interpolation with dy/dvin from the solver (as the shaper's trials do). The
 * curve is smooth (exponential junctions, no corners), so 48 intervals hold
 * the samples within a few µV of a solve per sample (test/circuit/push-pull-network.test.ts).
 */
const intervals = 48;

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

/** Solve at `vin` from `from` (a neighbour's solution), retrying from scratch if Newton stalls. */
function solveAt(net: FollowerNetwork, vin: number, from: FollowerState): FollowerState {
  const s = solveFollower(net, vin, { ...from });
  return s.converged ? s : solveFollower(net, vin, freshState(vin));
}

export function evaluateNetwork(input: EvalInput<PushPullSettings>, source: Waveform): EvalOutput {
  const net = followerNetwork(input, source.frequency);
  const samples = source.samples;
  const n = samples.length;
  const out = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const zero = solveAt(net, 0, freshState(0));
  const { hi: top, lo: bottom } = extremes(samples);
  const k = top > bottom ? intervals : 0;
  const h = k > 0 ? (top - bottom) / k : 0;
  const ys = new Float64Array(k + 1);
  const slopes = new Float64Array(k + 1);
  const baseCurrent = new Float64Array(k + 1);
  const starved = new Uint8Array(k + 1);
  // Walk outwards from the knot nearest 0 V, each solve starting from its neighbour's.
  const m = k > 0 ? Math.min(k, Math.max(0, Math.round(-bottom / h))) : 0;
  const level = (j: number): number => (j === k ? top : bottom + j * h);
  const keep = (j: number, s: FollowerState): void => {
    ys[j] = s.converged ? s.y : Number.NaN;
    slopes[j] = s.slope;
    baseCurrent[j] = Math.max(s.icn / net.betaN, s.icp / net.betaP);
    // A bias diode carrying no forward current: Rb alone feeds that base (the drive is lost).
    starved[j] = s.j1 < 0.3 || s.j2 < 0.3 ? 1 : 0;
  };
  let s = solveAt(net, level(m), zero);
  keep(m, s);
  const mid = s;
  for (let j = m + 1; j <= k; j++) keep(j, (s = solveAt(net, level(j), s)));
  s = mid;
  for (let j = m - 1; j >= 0; j--) keep(j, (s = solveAt(net, level(j), s)));
  if (k === 0) out.fill(ys[0] as number);
  else {
    const scale = 1 / h;
    for (let i = 0; i < n; i++) {
      const u = ((samples[i] as number) - bottom) * scale;
      const j = Math.min(k - 1, Math.max(0, Math.floor(u)));
      const t = u - j;
      const y0 = ys[j] as number;
      const y1 = ys[j + 1] as number;
      const m0 = h * (slopes[j] as number);
      const m1 = h * (slopes[j + 1] as number);
      // Cubic Hermite between knots (any numerical analysis text).
      const d = y1 - y0;
      out[i] = y0 + t * (m0 + t * (3 * d - 2 * m0 - m1 + t * (m0 + m1 - 2 * d)));
    }
  }
  const { hi, lo } = extremes(out);
  const rload = input.settings.hasLoad ? (input.parts['Rload'] ?? Number.NaN) : Number.POSITIVE_INFINITY;
  let ibase = 0;
  for (let j = 0; j <= k; j++) ibase = Math.max(ibase, baseCurrent[j] as number);
  const values: Record<string, number> = {
    'out.vpp': hi - lo,
    deadband: zero.converged ? deadband(net, zero) : Number.NaN,
    // Per transistor: the two collector currents differ only by the offset's load current.
    iq: zero.converged ? 0.5 * (zero.icn + zero.icp) : Number.NaN,
    'out.dc': zero.converged ? zero.y : Number.NaN,
  };
  if (input.settings.hasLoad) {
    values['out.ipeak'] = Math.max(Math.abs(hi), Math.abs(lo)) / rload;
    values['base.ipeak'] = ibase;
  }
  const warnings: StageWarning[] = [];
  if (input.isTrial) return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
  if (starved.some((x) => x === 1)) {
    warnings.push({ message: `at the drive's peaks a bias diode stops conducting: Rb1/Rb2 (${formatValue(net.rb1, 'Ω')}, ${formatValue(net.rb2, 'Ω')}) cannot feed the base current the load needs, so the output flattens; lower Rb or raise the load resistance` });
  }
  if (zero.converged && 0.5 * (zero.icn + zero.icp) * (net.vpos - net.vneg) > hotWatts) {
    warnings.push({ message: `the standing current ${formatValue(values['iq'] as number, 'A')} makes each transistor dissipate over ${formatValue(hotWatts, 'W')} with no signal: expect hot parts and possible thermal runaway; caution, do not touch` });
  }
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
}
