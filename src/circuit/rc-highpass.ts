import { applyResponse, type ComplexSlot } from './harmonic-response.js';
import { shortConductance } from './linear-net.js';
import { firstCrossing } from './response-search.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import { extremes } from './waveform.js';
import type { CheckSpec, Complex, EvalInput, EvalOutput, PartFaults, PartValue, StageFault, StageKind } from './types.js';

/** A passive RC high-pass has no settings beyond its parts. */
export type RcHighpassSettings = Readonly<Record<string, never>>;

/** Admittances of the two parts at `f` (S), with a fault applied. */
function admittances(c: number, r: number, f: number, fault: StageFault | undefined): { yc: number; yr: number } {
  const yc = fault?.role === 'C' ? (fault.mode === 'short' ? shortConductance : 0) : 2 * Math.PI * f * c;
  const yr = fault?.role === 'R' ? (fault.mode === 'short' ? shortConductance : 0) : 1 / r;
  return { yc, yr };
}

/**
 * H = Yc / (Yc + 1/R + Yload): the series C into R in parallel with whatever
 * loads the output (voltage divider of admittances, any circuits handbook). A
 * shorted C passes everything (H = 1, in phase); Yc is imaginary, or real and
 * large when shorted.
 */
function response(c: number, r: number, input: EvalInput<RcHighpassSettings>, f: number, out: ComplexSlot): void {
  const fault = input.fault;
  const { yc, yr } = admittances(c, r, f, fault);
  const isShortC = fault?.role === 'C' && fault.mode === 'short';
  const load: Complex | undefined = input.load?.('out', f);
  let lr = yr;
  let li = 0;
  if (load) {
    const d = load.re * load.re + load.im * load.im;
    if (d > 0) {
      lr += load.re / d;
      li -= load.im / d;
    } else lr += shortConductance;
  }
  // Numerator and denominator as complex numbers: Yc is j·yc unless shorted (real).
  const nr = isShortC ? yc : 0;
  const ni = isShortC ? 0 : yc;
  const dr = nr + lr;
  const di = ni + li;
  const d = dr * dr + di * di;
  if (d === 0) {
    // Nothing from the node to anywhere: with C open and R open, the output floats (read as 0 V).
    out.re = nr === 0 && ni === 0 ? 0 : 1;
    out.im = 0;
    return;
  }
  out.re = (nr * dr + ni * di) / d;
  out.im = (ni * dr - nr * di) / d;
}

function evaluate(input: EvalInput<RcHighpassSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('rc-highpass: no input waveform; the plan must name an "input"');
  const r = input.parts['R'] ?? Number.NaN;
  const c = input.parts['C'] ?? Number.NaN;
  // Corner of a first-order RC section: fc = 1 / (2π·R·C) (any circuits handbook).
  const ideal = 1 / (2 * Math.PI * r * c);
  const slot: ComplexSlot = { re: 0, im: 0 };
  const h = (f: number, o: ComplexSlot) => response(c, r, input, f, o);
  let fc = ideal;
  if (input.load || input.fault) {
    // Loaded or faulted: where |H| rises through 1/√2 of its high-frequency level (1 with a
    // resistive load; C/(C + Cload) with a capacitive one), read four decades above the corner.
    h(ideal * 1e4, slot);
    const top = Math.hypot(slot.re, slot.im);
    const g = (f: number) => {
      h(f, slot);
      return Math.hypot(slot.re, slot.im) - top * Math.SQRT1_2;
    };
    const low = ideal / 1e4;
    fc = !(top > 1e-9) ? Number.NaN : g(low) >= 0 ? 0 : firstCrossing(g, low, ideal * 1e4, 1.5, input.isTrial ? 1e-5 : 1e-9);
  }
  const n = source.samples.length;
  const target = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const out = applyResponse(source.samples, source.frequency, h, target);
  const { hi, lo } = extremes(out);
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values: { fc, 'out.vpp': hi - lo }, warnings: [] };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'fc',
    quantity: '−3 dB corner frequency',
    unit: 'Hz',
    output: 'out',
    instrument: 'scope',
    how: 'small sine in, lower the generator frequency until the output is 0.707 of its high-frequency level (45° ahead); read the generator',
  },
  {
    key: 'out.vpp',
    quantity: 'peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope at the filter output with the chain signal applied, 10× probe, DC coupling (the output sits at 0 V), read peak-to-peak',
    captureFigure: 'vpp',
  },
];

const faults: readonly PartFaults[] = [
  { role: 'C', modes: ['open', 'short'], description: 'series coupling capacitor' },
  { role: 'R', modes: ['open', 'short'], description: 'resistor from the output to ground' },
];

export const rcHighpassKind: StageKind<RcHighpassSettings> = {
  kind: 'rc-highpass',
  summary: 'first-order RC high-pass (coupling capacitor): corner 1/(2πRC), DC blocked, each harmonic attenuated and advanced; the next stage loads it',
  roles: [
    { role: 'C', unit: 'F', description: 'series capacitor from the input' },
    { role: 'R', unit: 'Ω', description: 'resistor from the output to ground' },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const p = nested(reader(raw, file), 'parts', true);
    onlyKeys(p, ['C', 'R']);
    const parts: Record<string, PartValue> = {
      // Above 1 F is a missing prefix or an RKM slip ("10k"), not a coupling capacitor.
      C: partAt(p, 'C', 'F', true, { positive: true, example: '"100n 10%"', plausible: [1e-15, 1] }),
      R: partAt(p, 'R', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
    };
    return { parts, settings: {} };
  },
  checks: () => checks,
  evaluate,
  traits: {},
  inputImpedance(x, f) {
    const c = x.parts['C'] ?? Number.NaN;
    const r = x.parts['R'] ?? Number.NaN;
    // Unloaded: R in series with the capacitor's reactance −j/(2πfC).
    if (!(f > 0)) return { re: Number.POSITIVE_INFINITY, im: 0 };
    return { re: r, im: -1 / (2 * Math.PI * f * c) };
  },
  outputImpedance(x, _output, f) {
    const c = x.parts['C'] ?? Number.NaN;
    const r = x.parts['R'] ?? Number.NaN;
    // R in parallel with the capacitor back to an ideal source: 1 / (1/R + j·2πfC).
    const g = 1 / r;
    const b = 2 * Math.PI * f * c;
    const d = g * g + b * b;
    return { re: g / d, im: -b / d };
  },
  faults: () => faults,
  faultHints: {
    fc: [
      'C a decade off (10n or 1µ fitted for 100n): the corner moves tenfold',
      'R the wrong value, or a ×10 slip',
      'the next stage loads the output: its input resistance is in parallel with R and raises the corner',
    ],
    'out.vpp': [
      'the input level is off: check the upstream stage first',
      'the corner is off: measure fc',
      'C open or a dry joint: no output at all',
      'C shorted (or an electrolytic fitted backwards and leaking): DC passes and the output sits off 0 V',
      'R open: the output floats, drifts and picks up hum',
    ],
  },
};
