import { formatValue } from '../units/format.js';
import { StageParseError } from './errors.js';
import { buildNet, faultedValue, type PlacedPart } from './filter-net.js';
import { filterFigures, type FilterFigures } from './filter-figures.js';
import { applyResponse } from './harmonic-response.js';
import { swing } from './opamp.js';
import { limitOutput } from './opamp-output.js';
import { netStability } from './net-stability.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, Complex, EvalInput, EvalOutput, ImpedanceInput, PartFaults, PartValue, RawStage, StageWarning } from './types.js';

/** Whether the stage has gain-setting resistors (K = 1 + Rf/Rg) or is a follower (K = 1). */
export interface SallenKeySettings {
  readonly hasGain: boolean;
}

export type SallenKeyVariant = 'lowpass' | 'highpass';

/** Net nodes: 0 ground, 1 input, A the junction of the two input parts, P the (+) input, N the (−) input. */
const A = 2;
const P = 3;
const OUT = 4;
const N = 5;

function placement(variant: SallenKeyVariant, hasGain: boolean): readonly PlacedPart[] {
  const filter: PlacedPart[] =
    variant === 'lowpass'
      ? [
          { role: 'R1', a: 1, b: A, type: 'R' },
          { role: 'R2', a: A, b: P, type: 'R' },
          { role: 'C1', a: A, b: OUT, type: 'C' },
          { role: 'C2', a: P, b: 0, type: 'C' },
        ]
      : [
          { role: 'C1', a: 1, b: A, type: 'C' },
          { role: 'C2', a: A, b: P, type: 'C' },
          { role: 'R1', a: A, b: OUT, type: 'R' },
          { role: 'R2', a: P, b: 0, type: 'R' },
        ];
  if (hasGain) filter.push({ role: 'Rf', a: OUT, b: N, type: 'R' }, { role: 'Rg', a: N, b: 0, type: 'R' });
  return filter;
}

/** Ideal figures from the closed forms (DESIGN §3; any active-filter handbook). */
export function sallenKeyIdeal(variant: SallenKeyVariant, v: Readonly<Record<string, number>>, k: number): { f0: number; q: number; denominator: number } {
  const r1 = v['R1'] ?? Number.NaN;
  const r2 = v['R2'] ?? Number.NaN;
  const c1 = v['C1'] ?? Number.NaN;
  const c2 = v['C2'] ?? Number.NaN;
  const root = Math.sqrt(r1 * r2 * c1 * c2);
  // f0 = 1/(2π√(R1R2C1C2)); Q = √(R1R2C1C2) / (C2(R1+R2) + (1−K)R1C1) for the low-pass,
  // √(R1R2C1C2) / (R1(C1+C2) + (1−K)R2C2) for the high-pass (node equations of the section).
  const denominator = variant === 'lowpass' ? c2 * (r1 + r2) + (1 - k) * r1 * c1 : r1 * (c1 + c2) + (1 - k) * r2 * c2;
  return { f0: 1 / (2 * Math.PI * root), q: root / denominator, denominator };
}

/** K = 1 + Rf/Rg (1 for a follower), with a fault on either resistor; never above the op-amp's own gain. */
function loopGain(input: EvalInput<SallenKeySettings>): number {
  if (!input.settings.hasGain) return 1;
  const rf = faultedValue('Rf', 'R', input.parts['Rf'] ?? Number.NaN, input.fault);
  const rg = faultedValue('Rg', 'R', input.parts['Rg'] ?? Number.NaN, input.fault);
  return Math.min(1 + rf / rg, input.opamp.aol);
}

export function evaluateSallenKey(variant: SallenKeyVariant, input: EvalInput<SallenKeySettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error(`sallen-key-${variant}: no input waveform; the plan must name an "input"`);
  const { hasGain } = input.settings;
  const fault = input.fault;
  const faulted: Record<string, number> = {};
  for (const role of ['R1', 'R2', 'C1', 'C2']) faulted[role] = faultedValue(role, role.startsWith('R') ? 'R' : 'C', input.parts[role] ?? Number.NaN, fault);
  const k = loopGain(input);
  const ideal = sallenKeyIdeal(variant, faulted, k);
  const nominalIdeal = sallenKeyIdeal(variant, input.parts, hasGain ? 1 + (input.parts['Rf'] ?? Number.NaN) / (input.parts['Rg'] ?? Number.NaN) : 1);
  const n = source.samples.length;
  const target = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const warnings: StageWarning[] = [];
  const net = buildNet(hasGain ? 6 : 5, placement(variant, hasGain), input.parts, fault, { out: OUT, plus: P, minus: hasGain ? N : OUT });
  // Its natural frequencies with the op-amp as it is (net-stability.ts): too much positive
  // feedback through the K path, or the op-amp's own lag at high Q, leaves poles on the right.
  const stability = netStability(net, input.opamp, 2 * Math.PI * nominalIdeal.f0);
  if (stability.kind !== 'stable') {
    // A complex pair grows into an oscillation near f0 that the rails limit; a real pole runs
    // the output to a rail and holds it there. Either way no filter figure can be read.
    const { high, low } = swing(input.opamp, input.supplies);
    const isOscillating = stability.kind === 'oscillates';
    for (let i = 0; i < n; i++) target[i] = isOscillating && i >= n / 2 ? low : high;
    if (!input.isTrial) {
      const what = isOscillating ? `oscillates between the rails (near ${formatValue(stability.frequency, 'Hz')} at onset)` : 'latches at a rail';
      const why =
        ideal.denominator > 0
          ? `the op-amp's lag at this Q (gain-bandwidth ${formatValue(input.opamp.gbw, 'Hz')})`
          : `K = ${k.toPrecision(3)}, too high for these parts`;
      warnings.push({ message: `the section is unstable (${why}): the stage ${what} instead of filtering` });
    }
    const values = { f0: Number.NaN, q: Number.NaN, fc: Number.NaN, gain: Number.NaN, 'out.vpp': isOscillating ? high - low : 0 };
    const frequency = isOscillating ? stability.frequency : 0;
    return { outputs: { out: { frequency, samples: isOscillating ? target : target.subarray(0, 1) } }, values, warnings };
  }
  const rtol = input.isTrial ? 1e-6 : 1e-10;
  const figures: FilterFigures = filterFigures(net, OUT, input.opamp, variant, nominalIdeal.f0, rtol);
  const out = applyResponse(source.samples, source.frequency, figures.response, target);
  const limited = limitOutput(out, source.frequency, input.opamp, input.supplies, input.isTrial === true);
  if (!input.isTrial) {
    warnings.push(...limited.warnings);
    const shift = Math.max(Math.abs(figures.f0 / nominalIdeal.f0 - 1), Math.abs(figures.q / nominalIdeal.q - 1));
    if (!fault && shift > 0.02) {
      warnings.push({
        message: `the op-amp's gain-bandwidth (${formatValue(input.opamp.gbw, 'Hz')}) moves f0 from ${formatValue(nominalIdeal.f0, 'Hz')} to ${formatValue(figures.f0, 'Hz')} and Q from ${nominalIdeal.q.toPrecision(3)} to ${figures.q.toPrecision(3)}; an op-amp of ${formatValue(100 * k * nominalIdeal.f0, 'Hz')} or more brings them back to the design`,
      });
    }
    if (!fault && nominalIdeal.q > 10)
      warnings.push({ message: `Q = ${nominalIdeal.q.toPrecision(3)}: a section this sharp moves with every percent of its parts; use 1 % parts or split it` });
  }
  const values = { f0: figures.f0, q: figures.q, fc: figures.fc, gain: figures.gain, 'out.vpp': limited.hi - limited.lo };
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
}

/** The input impedance: the input current flows through R1 (low-pass) or C1 (high-pass) into node A. */
export function sallenKeyInputImpedance(variant: SallenKeyVariant, x: ImpedanceInput<SallenKeySettings>, f: number): Complex {
  if (variant === 'highpass' && !(f > 0)) return { re: Number.POSITIVE_INFINITY, im: 0 };
  const { hasGain } = x.settings;
  const net = buildNet(hasGain ? 6 : 5, placement(variant, hasGain), x.parts, undefined, { out: OUT, plus: P, minus: hasGain ? N : OUT });
  net.solve(f, x.opamp);
  // Across the input part: 1 − V(A), with 1 V at the input.
  const dr = 1 - (net.re[A] as number);
  const di = -(net.im[A] as number);
  const d = dr * dr + di * di;
  // No current into the section at all (at DC the follower holds node A at the input): an open circuit.
  if (d === 0) return { re: Number.POSITIVE_INFINITY, im: 0 };
  if (variant === 'lowpass') {
    const r1 = x.parts['R1'] ?? Number.NaN;
    return { re: (r1 * dr) / d, im: (-r1 * di) / d };
  }
  // Z = 1 / (j·ω·C1·(1 − V(A))).
  const wc = 2 * Math.PI * f * (x.parts['C1'] ?? Number.NaN);
  const yr = -wc * di;
  const yi = wc * dr;
  const y = yr * yr + yi * yi;
  return { re: yr / y, im: -yi / y };
}

export function parseSallenKey(variant: SallenKeyVariant, raw: RawStage, file: string): { parts: Record<string, PartValue>; settings: SallenKeySettings } {
  const p = nested(reader(raw, file), 'parts', true);
  onlyKeys(p, ['R1', 'R2', 'C1', 'C2', 'Rf', 'Rg']);
  const r = (role: string, example: string) => partAt(p, role, 'Ω', true, { positive: true, plausible: ohmRange, example });
  // Above 1 F is a missing prefix or an RKM slip ("10k"), not a filter capacitor.
  const c = (role: string, example: string) => partAt(p, role, 'F', true, { positive: true, plausible: [1e-15, 1], example });
  const parts: Record<string, PartValue> = {
    R1: r('R1', '"10k 1%"'),
    R2: r('R2', '"10k 1%"'),
    C1: c('C1', variant === 'lowpass' ? '"22n 5%"' : '"10n 5%"'),
    C2: c('C2', '"10n 5%"'),
  };
  const rf = partAt(p, 'Rf', 'Ω', false, { positive: true, plausible: ohmRange, example: '"5k6 1%"' });
  const rg = partAt(p, 'Rg', 'Ω', false, { positive: true, plausible: ohmRange, example: '"10k 1%"' });
  if ((rf === undefined) !== (rg === undefined)) {
    const missing = rf === undefined ? 'Rf' : 'Rg';
    throw new StageParseError(
      file,
      `${p.path}.${missing}`,
      `missing; gain needs both Rf (output to −in) and Rg (−in to ground), e.g. "Rf": "5k6 1%", "Rg": "10k 1%"; for a unity-gain follower leave out both`,
    );
  }
  if (rf && rg) {
    parts['Rf'] = rf;
    parts['Rg'] = rg;
  }
  return { parts, settings: { hasGain: rf !== undefined } };
}

export function sallenKeyChecks(variant: SallenKeyVariant): readonly CheckSpec[] {
  const lag = variant === 'lowpass' ? '90° behind' : '90° ahead of';
  const passband = variant === 'lowpass' ? 'at a tenth of f0 or lower' : 'at thirty times f0';
  return [
    {
      key: 'f0',
      quantity: 'natural frequency (90° phase point)',
      unit: 'Hz',
      output: 'out',
      instrument: 'scope',
      how: `two channels, input and output, small sine: tune the generator until the output is ${lag} the input (X-Y: an upright ellipse); read the generator`,
    },
    {
      key: 'q',
      quantity: 'Q (gain at f0 over passband gain)',
      unit: 'V/V',
      output: 'out',
      instrument: 'scope',
      how: `output over input at f0, divided by the passband gain (${passband})`,
    },
    {
      key: 'fc',
      quantity: '−3 dB corner frequency',
      unit: 'Hz',
      output: 'out',
      instrument: 'scope',
      how: 'small sine, tune the generator until the output is 0.707 of its passband level; read the generator',
    },
    {
      key: 'gain',
      quantity: 'passband gain',
      unit: 'V/V',
      output: 'out',
      instrument: 'scope',
      how: `output over input peak-to-peak ${passband}, small signal so nothing clips`,
    },
    {
      key: 'out.vpp',
      quantity: 'peak-to-peak',
      unit: 'V',
      output: 'out',
      instrument: 'scope',
      how: 'scope at the filter output with the chain signal applied, 10× probe, read peak-to-peak',
      captureFigure: 'vpp',
    },
  ];
}

export function sallenKeyFaults(settings: SallenKeySettings): readonly PartFaults[] {
  const list: PartFaults[] = [
    { role: 'R1', modes: ['open', 'short'], description: 'first resistor of the section' },
    { role: 'R2', modes: ['open', 'short'], description: 'second resistor, into the + input' },
    { role: 'C1', modes: ['open', 'short'], description: 'first capacitor of the section' },
    { role: 'C2', modes: ['open', 'short'], description: 'second capacitor, at the + input' },
  ];
  if (settings.hasGain) {
    list.push(
      { role: 'Rf', modes: ['open', 'short'], description: 'gain resistor from the output to the − input' },
      { role: 'Rg', modes: ['open', 'short'], description: 'gain resistor from the − input to ground' },
    );
  }
  return list;
}

export function sallenKeyHints(variant: SallenKeyVariant): Readonly<Record<string, readonly string[]>> {
  const pass =
    variant === 'lowpass' ? 'C1 from node A to the output and C2 from + input to ground' : 'R1 from node A to the output and R2 from + input to ground';
  return {
    f0: [
      'a capacitor a decade off (1n or 100n fitted for 10n): f0 moves by √10',
      'R1 and R2, or C1 and C2, swapped: f0 stays, Q changes (check the peak)',
      'a slower op-amp than the plan assumes: f0 and Q drift when the gain-bandwidth is within 100× of f0',
    ],
    q: [
      `the two capacitors (or resistors) swapped: ${pass} set the damping`,
      'Rf or Rg the wrong value: Q rises steeply as K = 1 + Rf/Rg approaches 3',
      'Rf open: the op-amp runs open loop and the output sits at a rail or oscillates',
    ],
    fc: ['read f0 and Q first: the corner follows from both', 'the probe or the next stage loading the output through a long lead (10× probe)'],
    gain: ['Rf or Rg wrong, swapped or open (Rg open: a follower, gain 1)', 'the input level is off: check the upstream stage'],
    'out.vpp': [
      'the input level is off: check the upstream stage first',
      'clipping: a flat top means the rails are low or the signal too big for this gain',
      'a part open or shorted: output missing, stuck at a rail, or the response flat',
    ],
  };
}
