import { formatValue } from '../units/format.js';
import { type DiodeModel, thermalVoltage } from './diode.js';
import { parseDiodeModel } from './diode-parse.js';
import { faultedValue } from './filter-net.js';
import { shortConductance } from './linear-net.js';
import { swing } from './opamp.js';
import { limitOutput } from './opamp-output.js';
import { findRoot } from './response-search.js';
import { fastThd } from './spectrum.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartFaults, PartValue, StageFault, StageKind, StageWarning } from './types.js';
import { defaultSamples } from './waveform.js';
import { balance, balancedOutput } from './wien-balance.js';
import { pathFunction, pathWave, smallSignalGain, type WienGainPath } from './wien-limiter.js';

export interface WienBridgeSettings {
  /** Rf2 with its antiparallel diode pair is fitted. */
  readonly hasLimiter: boolean;
  readonly diode: DiodeModel;
  /** Model name, or `custom`. */
  readonly diodeName: string;
}

/**
 * L(f) = β(jω) − 1/A(jω): β the bridge's transfer from the output to the (+)
 * input, Zp/(Zs + Zp) with Zs = R1 + 1/(jωC1) and Zp = R2 ∥ 1/(jωC2); A the
 * one-pole op-amp (1/A = 1/aol + j·f/GBW). With the gain path's describing
 * gain G (real: the path is static), the loop closes where G·L = 1: Im L = 0
 * sets the frequency whatever the amplitude, and G = 1/Re L the amplitude.
 * (Loop equations of the non-inverting stage with finite gain, Sedra and
 * Smith; describing-function method for the amplitude.)
 */
function loop(
  x: Readonly<Record<string, number>>,
  fault: StageFault | undefined,
  op: { aol: number; gbw: number },
  f: number,
  out: { re: number; im: number },
): void {
  const w = 2 * Math.PI * f;
  const mode = (role: string) => (fault && fault.role === role ? fault.mode : undefined);
  const isOpen = (role: string) => mode(role) === 'open' || mode(role) === 'missing';
  const r1 = x['R1'] ?? Number.NaN;
  const c1 = x['C1'] ?? Number.NaN;
  let br = 0;
  let bi = 0;
  const c1Short = mode('C1') === 'short';
  if (!(isOpen('R1') || isOpen('C1') || (w === 0 && !c1Short))) {
    const zr = mode('R1') === 'short' ? 0 : r1;
    const zi = c1Short ? 0 : -1 / (w * c1);
    const r2 = x['R2'] ?? Number.NaN;
    const c2 = x['C2'] ?? Number.NaN;
    const yr = isOpen('R2') ? 0 : mode('R2') === 'short' ? shortConductance : 1 / r2;
    const yi = isOpen('C2') ? 0 : mode('C2') === 'short' ? 0 : w * c2;
    const yExtra = mode('C2') === 'short' ? shortConductance : 0;
    // β = 1 / (1 + Zs·Yp)
    const pr = 1 + zr * (yr + yExtra) - zi * yi;
    const pi = zr * yi + zi * (yr + yExtra);
    const d = pr * pr + pi * pi;
    br = pr / d;
    bi = -pi / d;
  }
  out.re = br - 1 / op.aol;
  out.im = bi - f / op.gbw;
}

function gainPath(input: EvalInput<WienBridgeSettings>, high: number, low: number): WienGainPath {
  const { parts, fault, settings } = input;
  const diodesGone = !settings.hasLimiter || (fault?.role === 'diodes' && (fault.mode === 'open' || fault.mode === 'missing'));
  const diodesShorted = fault?.role === 'diodes' && fault.mode === 'short';
  const rf2 = settings.hasLimiter ? (diodesShorted ? 1e-3 : faultedValue('Rf2', 'R', parts['Rf2'] ?? Number.NaN, fault)) : 0;
  return {
    rg: faultedValue('Rg', 'R', parts['Rg'] ?? Number.NaN, fault),
    rf1: faultedValue('Rf1', 'R', parts['Rf1'] ?? Number.NaN, fault),
    rf2: rf2 >= 1e15 ? Number.POSITIVE_INFINITY : rf2,
    diode: diodesGone || diodesShorted ? undefined : settings.diode,
    aol: input.opamp.aol,
    high,
    low,
  };
}

/** The ideal forms: f0 and the gain the bridge needs to start (1/β at f0). */
export function wienIdeal(parts: Readonly<Record<string, number>>): { f0: number; startGain: number } {
  const r1 = parts['R1'] ?? Number.NaN;
  const r2 = parts['R2'] ?? Number.NaN;
  const c1 = parts['C1'] ?? Number.NaN;
  const c2 = parts['C2'] ?? Number.NaN;
  // f0 = 1/(2π√(R1R2C1C2)); the bridge passes 1/(1 + R1/R2 + C2/C1) there (DESIGN §3; Sedra and Smith, the Wien-bridge oscillator).
  return { f0: 1 / (2 * Math.PI * Math.sqrt(r1 * r2 * c1 * c2)), startGain: 1 + r1 / r2 + c2 / c1 };
}

function evaluate(input: EvalInput<WienBridgeSettings>): EvalOutput {
  const { parts, opamp, fault } = input;
  const { f0, startGain: needed } = wienIdeal(parts);
  const { high, low } = swing(opamp, input.supplies);
  if (!(high > 0 && low < 0)) {
    // Single supply: the bridge here is referred to ground and needs the output to swing both ways.
    const why = `the op-amp's output reaches only ${formatValue(low, 'V')} … ${formatValue(high, 'V')}: a Wien bridge referred to ground needs a negative rail (a mid-rail bias is not modelled)`;
    return {
      outputs: { out: { frequency: 0, samples: new Float64Array([Math.max(low, Math.min(high, 0))]) } },
      values: { freq: Number.NaN, 'out.vpp': 0, 'out.thd': Number.NaN },
      warnings: input.isTrial ? [] : [{ message: why }],
    };
  }
  const path = gainPath(input, high, low);
  const nvt = thermalVoltage() * input.settings.diode.n;
  const g0 = smallSignalGain(path, nvt);
  const warnings: StageWarning[] = [];
  const isTrial = input.isTrial === true;
  const n = defaultSamples;
  const out = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const slot = { re: 0, im: 0 };
  const at = (f: number) => {
    loop(parts, fault, opamp, f, slot);
    return slot;
  };
  const still = (level: number, why: string): EvalOutput => {
    out.fill(level);
    if (!isTrial) warnings.push({ message: why });
    return { outputs: { out: { frequency: 0, samples: out.subarray(0, 1) } }, values: { freq: Number.NaN, 'out.vpp': 0, 'out.thd': Number.NaN }, warnings };
  };
  // Positive feedback down to DC (a capacitor shorted; R2 open, leaving the capacitive divider
  // C1/(C1 + C2)): a real right-half-plane pole, the output runs to a rail and stays.
  if (g0 * at(f0 * 1e-6).re > 1) return still(high, 'the bridge passes DC back to the + input with more than unity loop gain: the output latches at a rail');
  // The oscillation frequency: Im L = 0 with the most loop gain, on a log grid three decades either side of f0.
  let best = Number.NaN;
  let bestRe = 0;
  let fa = f0 / 1000;
  let ia = at(fa).im;
  for (let fb = fa * 1.25; fb <= f0 * 1000; fb *= 1.25) {
    const ib = at(fb).im;
    if (ia * ib < 0) {
      const fx = findRoot((f) => at(f).im, fa, fb, isTrial ? 1e-7 : 1e-11);
      const re = at(fx).re;
      if (re > bestRe) {
        bestRe = re;
        best = fx;
      }
    }
    fa = fb;
    ia = ib;
  }
  const target = bestRe > 0 ? 1 / bestRe : Number.POSITIVE_INFINITY;
  if (!(g0 > target)) {
    return still(
      0,
      Number.isFinite(target)
        ? `it will not start: the gain path gives ${g0.toPrecision(4)} at small signal but the bridge needs more than ${target.toPrecision(4)} (1 + R1/R2 + C2/C1 = ${needed.toPrecision(4)} with an ideal op-amp): raise Rf1 + Rf2 or lower Rg`
        : 'it will not start: the bridge returns nothing to the + input',
    );
  }
  // Amplitude at the (+) input where the describing gain falls to the target (log-axis root).
  const top = 2 * Math.max(Math.abs(high), Math.abs(low));
  // From 1 µ of the swing (no diode conducts yet, the gain is the small-signal one) to the swing.
  // The describing gain from 64 samples a period: the fundamental of a smooth wave needs no
  // more (trapezoid rule on a periodic function); the output is then drawn at full length.
  const coarse = new Float64Array(64);
  const shape = pathFunction(path, nvt, 1.5 * top);
  const vp = findRoot((v) => pathWave(shape, v, coarse) / v - target, top * 1e-6, top, isTrial ? 1e-6 : 1e-10);
  // Refine with the harmonics the bridge returns (wien-balance.ts), from the describing-function start.
  const problem = {
    shape,
    slew: opamp.slew,
    loopAt: (f: number, o: { re: number; im: number }) => loop(parts, fault, opamp, f, o),
    bridgeAt: (f: number, o: { re: number; im: number }) => {
      loop(parts, fault, opamp, f, o);
      o.re += 1 / opamp.aol;
      o.im += f / opamp.gbw;
    },
  };
  const balanced = balance(problem, best, vp, 64, 60, isTrial ? 1e-6 : 1e-9);
  if (balanced.converged) {
    best = balanced.f;
    balancedOutput(problem, balanced, out);
  } else {
    // Far into slewing the balance may not settle: keep the describing-function answer, and say so.
    pathWave(shape, vp, out);
    if (!isTrial)
      warnings.push({
        message: 'the frequency and level are the first-harmonic estimate only: the output is far into slewing, and the real oscillator runs lower than shown',
      });
  }
  const limited = limitOutput(out, best, opamp, input.supplies, isTrial);
  if (!isTrial) {
    const clips = out.some((v) => v >= high - 1e-9) || out.some((v) => v <= low + 1e-9);
    if (clips && !input.settings.hasLimiter)
      warnings.push({
        message: `without Rf2 and its diodes nothing limits the amplitude but the op-amp's swing: the output clips at ${formatValue(low, 'V')} … ${formatValue(high, 'V')} and the sine is flattened; fit Rf2 with two antiparallel diodes across it`,
      });
    else if (clips && !fault)
      warnings.push({
        message: `the diodes do not bring the gain back before the output reaches the rails (1 + Rf1/Rg = ${(1 + path.rf1 / path.rg).toPrecision(3)} is not below ${target.toPrecision(3)}): it clips; lower Rf1`,
      });
    if (!fault && g0 < target * 1.05)
      warnings.push({
        message: `the start-up margin is thin (small-signal gain ${g0.toPrecision(4)} against ${target.toPrecision(4)} needed): with part tolerances some boards will not start`,
      });
    warnings.push(...limited.warnings);
  }
  // THD per DESIGN §4 (harmonics 2…50 over the fundamental), of the output as drawn: the diodes'
  // and the swing's distortion; an op-amp's own distortion near its gain-bandwidth is not in it.
  return { outputs: { out: { frequency: best, samples: out } }, values: { freq: best, 'out.vpp': limited.hi - limited.lo, 'out.thd': fastThd(out) }, warnings };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'freq',
    quantity: 'frequency',
    unit: 'Hz',
    output: 'out',
    instrument: 'counter',
    how: 'counter or scope frequency readout at the oscillator output, 10× probe (a 1× probe loads the bridge)',
    captureFigure: 'frequency',
  },
  {
    key: 'out.vpp',
    quantity: 'peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope at the oscillator output once the amplitude has settled (a second or so), 10× probe, read peak-to-peak',
    captureFigure: 'vpp',
  },
  {
    key: 'out.thd',
    quantity: 'total harmonic distortion',
    unit: '1',
    output: 'out',
    instrument: 'scope',
    how: 'distortion analyser, or a scope capture analysed for THD (harmonics 2 to 50): the limiting diodes leave a few per cent',
    captureFigure: 'thd',
    floor: 0,
  },
];

function faults(settings: WienBridgeSettings): readonly PartFaults[] {
  const list: PartFaults[] = [
    { role: 'R1', modes: ['open', 'short'], description: 'series-arm resistor (output to + input)' },
    { role: 'C1', modes: ['open', 'short'], description: 'series-arm capacitor' },
    { role: 'R2', modes: ['open', 'short'], description: 'shunt-arm resistor (+ input to ground)' },
    { role: 'C2', modes: ['open', 'short'], description: 'shunt-arm capacitor' },
    { role: 'Rg', modes: ['open', 'short'], description: 'gain resistor, − input to ground' },
    { role: 'Rf1', modes: ['open', 'short'], description: 'feedback resistor, output side' },
  ];
  if (settings.hasLimiter) {
    list.push(
      { role: 'Rf2', modes: ['open', 'short'], description: 'feedback resistor the diodes sit across' },
      { role: 'diodes', modes: ['open', 'short'], description: 'antiparallel limiting diode pair across Rf2' },
    );
  }
  return list;
}

export const wienBridgeKind: StageKind<WienBridgeSettings> = {
  kind: 'wien-bridge',
  summary:
    'Wien-bridge sine oscillator: f0 1/(2π√(R1R2C1C2)) shifted by the op-amp gain-bandwidth, start-up check, amplitude where the diodes across Rf2 bring the loop gain back (clips without them)',
  roles: [
    { role: 'R1', unit: 'Ω', description: 'series-arm resistor, output to + input (with C1)' },
    { role: 'C1', unit: 'F', description: 'series-arm capacitor' },
    { role: 'R2', unit: 'Ω', description: 'shunt-arm resistor, + input to ground (with C2)' },
    { role: 'C2', unit: 'F', description: 'shunt-arm capacitor' },
    { role: 'Rg', unit: 'Ω', description: 'gain resistor, − input to ground' },
    { role: 'Rf1', unit: 'Ω', description: 'feedback resistor from the output' },
    { role: 'Rf2', unit: 'Ω', description: 'feedback resistor to the − input, with two antiparallel diodes across it', optional: true },
  ],
  outputs: ['out'],
  needsInput: false,
  parse(raw, file) {
    const r = reader(raw, file);
    const p = nested(r, 'parts', true);
    onlyKeys(p, ['R1', 'C1', 'R2', 'C2', 'Rg', 'Rf1', 'Rf2']);
    const res = (role: string, example: string) => partAt(p, role, 'Ω', true, { positive: true, plausible: ohmRange, example });
    // Above 1 F is a missing prefix or an RKM slip ("10k"), not a timing capacitor.
    const cap = (role: string) => partAt(p, role, 'F', true, { positive: true, plausible: [1e-15, 1], example: '"10n 5%"' });
    const parts: Record<string, PartValue> = {
      R1: res('R1', '"15k 1%"'),
      C1: cap('C1'),
      R2: res('R2', '"15k 1%"'),
      C2: cap('C2'),
      Rg: res('Rg', '"10k 1%"'),
      Rf1: res('Rf1', '"15k 1%"'),
    };
    const rf2 = partAt(p, 'Rf2', 'Ω', false, { positive: true, plausible: ohmRange, example: '"10k 1%"' });
    if (rf2) parts['Rf2'] = rf2;
    const diode = parseDiodeModel(r);
    return { parts, settings: { hasLimiter: rf2 !== undefined, diode: diode.model, diodeName: diode.name } };
  },
  checks: () => checks,
  evaluate,
  traits: { usesOpamp: true },
  faults,
  faultHints: {
    freq: [
      'a bridge capacitor the wrong value (C1 or C2): f0 moves with √(C1·C2)',
      'R1 or R2 the wrong value or swapped with another arm',
      'a slow op-amp: its phase lag pulls the frequency down when the gain-bandwidth is not far above 3·f0',
    ],
    'out.thd': [
      'high: the amplitude runs into the rails (a diode open, Rf2 open, or Rf1 too large)',
      'high: the start-up gain set far above the bridge loss, so the diodes work hard',
      'low and the amplitude unsteady: the start-up margin is too thin',
    ],
    'out.vpp': [
      'no output at all: the stage did not start — Rf2 shorted, Rg too large or Rf1 too small (the gain must exceed 1 + R1/R2 + C2/C1, 3 for equal arms)',
      'a flat-topped output at the rails: a limiting diode open or missing, or Rf2 open',
      'low amplitude: a diode of another type (a Schottky or an LED limits at another voltage)',
      'output stuck at a rail: a bridge capacitor shorted, R2 open, or Rf1 open',
    ],
  },
};
