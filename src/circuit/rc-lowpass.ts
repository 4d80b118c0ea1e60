import { add, capacitor, isOpen, open, parallel, resistance } from './complex.js';
import { applyResponse } from './response.js';
import { singlePole } from './single-pole.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import { dc, extremes } from './waveform.js';
import { faultedParts, isFault, resistorFaults } from './faults.js';
import type { CheckSpec, Complex, EvalInput, EvalOutput, PartValue, StageKind } from './types.js';

/** A passive RC low-pass has no settings beyond its parts. */
export type RcLowpassSettings = Readonly<Record<string, never>>;

/** A harmonic this far up stands for "well above the signal" when telling a resistive load from a reactive one. */
const probeHarmonic = 64;

/**
 * Loaded: the output node is C in parallel with the load ZL, fed through R, so
 * H(f) = Zp/(R + Zp) with Zp = 1/(jωC) ‖ ZL (Kirchhoff at the node). `fc` is
 * the −3 dB corner of that loaded transfer function, |H(fc)| = |H(0)|/√2, the
 * corner a technician finds on the bench with the next stage connected.
 * A resistive load RL (real and the same at the fundamental and far above it,
 * as an inverting amplifier's Rin or a follower's bias network) keeps a single
 * pole: H(0) = RL/(R + RL) and fc = 1/(2π·(R‖RL)·C) (Thevenin equivalent of R
 * and RL), computed in the time domain like the unloaded stage. Any other load
 * goes harmonic by harmonic (response.ts) and its corner is found by bisection.
 */
function evaluate(input: EvalInput<RcLowpassSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('rc-lowpass: no input waveform; the plan must name an "input"');
  const parts = faultedParts(input, ['R'], ['C']);
  const r = parts['R'] ?? Number.NaN;
  const c = parts['C'] ?? Number.NaN;
  // C shorted: the output node is tied to ground; nothing passes and no corner can be found.
  if (isFault(input.fault, 'C', 'short')) return { outputs: { out: dc(0) }, values: { fc: Number.NaN, 'out.vpp': 0 }, warnings: [] };
  const load = input.load;
  const f0 = source.frequency;
  const zl = load ? load('out', f0 > 0 ? f0 : 0) : undefined;
  const zHigh = load && f0 > 0 ? load('out', probeHarmonic * f0) : zl;
  let fc: number;
  let out: Float64Array;
  if (zl === undefined || isOpen(zl)) {
    // Corner of a first-order RC section: fc = 1 / (2π·R·C) (any circuits handbook).
    fc = 1 / (2 * Math.PI * r * c);
    // Unloaded output: every harmonic attenuated as 1/(1 + j·f/fc) (see single-pole.ts).
    out = singlePole(source.samples, f0, fc, input.buffer?.(0, source.samples.length));
  } else if (zl.im === 0 && zHigh !== undefined && zHigh.im === 0 && zHigh.re === zl.re) {
    const rl = zl.re;
    // Thevenin: RL/(R + RL) of the input behind R‖RL, corner 1/(2π·(R‖RL)·C).
    const share = rl / (r + rl);
    fc = 1 / (2 * Math.PI * ((r * rl) / (r + rl)) * c);
    out = singlePole(source.samples, f0, fc, input.buffer?.(0, source.samples.length));
    for (let i = 0; i < out.length; i++) out[i] = share * (out[i] as number);
  } else {
    active.r = r;
    active.c = c;
    active.load = load;
    out = applyResponse(source.samples, f0, activeResponse);
    // A start near the answer: the corner with the load's resistance at the fundamental.
    const rl = zl.re > 0 ? zl.re : Number.POSITIVE_INFINITY;
    fc = activeCorner(1 / (2 * Math.PI * (Number.isFinite(rl) ? (r * rl) / (r + rl) : r) * c));
    active.load = undefined;
  }
  const { hi, lo } = extremes(out);
  return { outputs: { out: { frequency: f0, samples: out } }, values: { fc, 'out.vpp': hi - lo }, warnings: [] };
}

/**
 * The loaded stage being evaluated, for the plain functions below (no closure
 * per trial). H = Zp/(R + Zp) with Zp = 1/(jωC) ‖ ZL is 1/(1 + R·(jωC + YL)),
 * YL = 1/ZL = gL + j·bL: one division, no complex objects.
 */
const active: { r: number; c: number; load: EvalInput<RcLowpassSettings>['load'] } = { r: 0, c: 0, load: undefined };

/** Real and imaginary parts of 1/H at f, into `inverse`. */
const inverse = { re: 1, im: 0 };
function inverseResponse(f: number): void {
  const z = active.load?.('out', f);
  let gl = 0;
  let bl = 0;
  if (z !== undefined && Number.isFinite(z.re) && Number.isFinite(z.im)) {
    const d = z.re * z.re + z.im * z.im;
    gl = z.re / d;
    bl = -z.im / d;
  }
  inverse.re = 1 + active.r * gl;
  inverse.im = active.r * (2 * Math.PI * f * active.c + bl);
}

function activeResponse(f: number): Complex {
  inverseResponse(f);
  const d = inverse.re * inverse.re + inverse.im * inverse.im;
  return { re: inverse.re / d, im: -inverse.im / d };
}

/** |H(f)|² of the active stage. */
function activeMagnitude(f: number): number {
  inverseResponse(f);
  return 1 / (inverse.re * inverse.re + inverse.im * inverse.im);
}

/**
 * The active stage's loaded corner by fixed-point iteration: with the load's
 * admittance held at its value at the last estimate, |1/H|² = (1 + R·gL)² +
 * (ωRC + R·bL)² = 2·|1/H(0)|² is solved for ω in closed form; the load varies
 * slowly with f, so a few rounds settle to 1e-10. Should they not, the
 * bracketing search below decides.
 */
function activeCorner(guess: number): number {
  inverseResponse(0);
  const target = 2 * (inverse.re * inverse.re + inverse.im * inverse.im);
  let w = 2 * Math.PI * guess;
  const rc = active.r * active.c;
  for (let it = 0; it < 12; it++) {
    inverseResponse(w / (2 * Math.PI));
    const disc = target - inverse.re * inverse.re;
    if (!(disc > 0)) break;
    const next = (Math.sqrt(disc) - (inverse.im - w * rc)) / rc;
    if (!(next > 0)) break;
    if (Math.abs(next - w) < 1e-10 * w) return next / (2 * Math.PI);
    w = next;
  }
  return loadedCorner(activeMagnitude, guess);
}

/**
 * Where |h(f)|² (`mag2`) falls to half of |h(0)|²: secant steps on ln|h|²
 * against ln f (nearly straight there) from `guess`, kept when they settle
 * within a decade of it; otherwise a bracket around `guess` (widened until it
 * holds the crossing), then regula falsi with the Illinois step; to 1e-9
 * relative either way. On a loaded ladder every call of `mag2` asks the load at
 * a new frequency, which recurses down the chain: the secant steps settle in
 * about 5 calls where the bracket took about 12 (bench/plan-size.bench.ts).
 */
export function loadedCorner(mag2: (f: number) => number, guess: number): number {
  const target = Math.log(0.5 * mag2(0));
  const quick = secantCorner(mag2, guess, target);
  if (!Number.isNaN(quick)) return quick;
  return bracketCorner(mag2, guess, target);
}

/** The secant steps of `loadedCorner`; NaN when they do not settle near `guess`. */
function secantCorner(mag2: (f: number) => number, guess: number, target: number): number {
  const x0 = Math.log(guess);
  let a = x0;
  let fa = Math.log(mag2(guess)) - target;
  if (!Number.isFinite(fa)) return Number.NaN;
  // |h| falls with f, and ln|h|² against ln f falls with a slope near 1 at a single pole's
  // corner: the crossing lies about the excess above (a step of at most one e-fold).
  let b = a + (fa >= 0 ? 1 : -1) * Math.min(1, Math.max(0.1, Math.abs(fa)));
  let fb = Math.log(mag2(Math.exp(b))) - target;
  for (let i = 0; i < 12; i++) {
    // Only a falling crossing is the corner (as the bracket takes it); anything else goes to the bracket.
    if (!Number.isFinite(fb) || !((fb - fa) / (b - a) < 0)) return Number.NaN;
    if (Math.abs(fb) < 1e-12) return Math.exp(b);
    const x = b - (fb * (b - a)) / (fb - fa);
    if (!(Math.abs(x - x0) < Math.LN10)) return Number.NaN;
    if (Math.abs(x - b) < 1e-10) return Math.exp(x);
    a = b;
    fa = fb;
    b = x;
    fb = Math.log(mag2(Math.exp(b))) - target;
  }
  return Number.NaN;
}

/** The bracketing search of `loadedCorner`, for a crossing the secant steps missed. */
function bracketCorner(mag2: (f: number) => number, guess: number, target: number): number {
  let a = Math.log(guess) - 0.1;
  let b = Math.log(guess) + 0.1;
  let fa = Math.log(mag2(Math.exp(a))) - target;
  let fb = Math.log(mag2(Math.exp(b))) - target;
  for (let i = 0; i < 40 && !(fa > 0 && fb < 0); i++) {
    if (!(fa > 0)) {
      a -= 0.5 + i;
      fa = Math.log(mag2(Math.exp(a))) - target;
    }
    if (!(fb < 0)) {
      b += 0.5 + i;
      fb = Math.log(mag2(Math.exp(b))) - target;
    }
  }
  if (!(fa > 0 && fb < 0)) return Number.NaN;
  let side = 0;
  for (let i = 0; i < 100 && b - a > 1e-9; i++) {
    const x = (a * fb - b * fa) / (fb - fa);
    const fx = Math.log(mag2(Math.exp(x))) - target;
    if (fx > 0) {
      a = x;
      fa = fx;
      if (side === 1) fb /= 2;
      side = 1;
    } else {
      b = x;
      fb = fx;
      if (side === -1) fa /= 2;
      side = -1;
    }
    if (Math.abs(fx) < 1e-12) return Math.exp(x);
  }
  return Math.exp(0.5 * (a + b));
}

/**
 * Input: R in series with C ‖ the load on the output (Kirchhoff, series and
 * parallel impedances), R + 1/(jωC + 1/ZL) through admittances in plain numbers:
 * on a ladder this runs once per stage downstream for every load asked, and the
 * complex helpers' six objects per step were a third of it (measured).
 */
function inputImpedance(x: Parameters<NonNullable<StageKind<RcLowpassSettings>['inputImpedance']>>[0], f: number): Complex {
  const r = x.parts['R'] ?? Number.NaN;
  const c = x.parts['C'] ?? Number.NaN;
  const zl = x.load?.('out', f);
  const zc = capacitor(c, f);
  // An open capacitor (DC) leaves the load alone; an open load leaves the capacitor.
  if (isOpen(zc) || zl === undefined || isOpen(zl)) return add(resistance(r), parallel(zc, zl));
  const dl = zl.re * zl.re + zl.im * zl.im;
  // A shorted load shorts the node: only R is left.
  if (dl === 0) return resistance(r);
  const yre = zl.re / dl;
  const yim = 2 * Math.PI * f * c - zl.im / dl;
  const d = yre * yre + yim * yim;
  if (d === 0) return open;
  return { re: r + yre / d, im: -yim / d };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'fc',
    quantity: '−3 dB corner frequency',
    unit: 'Hz',
    output: 'out',
    instrument: 'scope',
    how: 'next stage connected, small sine in: raise the generator frequency until the output falls to 0.707 of its low-frequency level; read the generator',
  },
  {
    key: 'out.vpp',
    captureFigure: 'vpp',
    quantity: 'peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope at the filter output with the chain signal applied, 10× probe (a 1× probe adds about 100 pF), read peak-to-peak',
  },
];

export const rcLowpassKind: StageKind<RcLowpassSettings> = {
  kind: 'rc-lowpass',
  summary: 'first-order RC low-pass: corner 1/(2πRC), each harmonic of the signal attenuated and delayed',
  traits: { usesOpamp: false, isAmplifier: false, isHandWritten: false },
  roles: [
    { role: 'R', unit: 'Ω', description: 'series resistor' },
    { role: 'C', unit: 'F', description: 'shunt capacitor to ground' },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const p = nested(reader(raw, file), 'parts', true);
    onlyKeys(p, ['R', 'C']);
    const parts: Record<string, PartValue> = {
      R: partAt(p, 'R', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
      // Above 1 F is a missing prefix or an RKM slip ("10k"), not a filter capacitor.
      C: partAt(p, 'C', 'F', true, { positive: true, example: '"10n 5%"', plausible: [1e-15, 1] }),
    };
    return { parts, settings: {} };
  },
  checks: () => checks,
  evaluate,
  faults: () => [...resistorFaults(['R'], { R: 'series resistor' }), { role: 'C', modes: ['open', 'short'], description: 'filter capacitor' }],
  inputImpedance,
  // Output, seen from downstream: the Thevenin impedance R ‖ 1/(jωC).
  outputImpedance: (x, _output, f) => parallel(resistance(x.parts['R'] ?? Number.NaN), capacitor(x.parts['C'] ?? Number.NaN, f)),
  faultHints: {
    fc: [
      'C a decade off (1n or 100n fitted for 10n): the corner moves tenfold',
      'R the wrong value, or a ×10 slip',
      'the next stage or the probe loading the output (a 1× probe adds about 100 pF)',
    ],
    'out.vpp': [
      'the input level is off: check the upstream stage first',
      'the corner is off: measure fc',
      'C open or not fitted: no attenuation at all',
      'C shorted: no output',
    ],
  },
};
