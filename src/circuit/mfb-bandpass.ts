import { formatValue } from '../units/format.js';
import { buildNet, type PlacedPart } from './filter-net.js';
import { filterFigures } from './filter-figures.js';
import { applyResponse } from './harmonic-response.js';
import { swing } from './opamp.js';
import { limitOutput } from './opamp-output.js';
import { netStability } from './net-stability.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';

/** A multiple-feedback band-pass has no settings beyond its parts. */
export type MfbBandpassSettings = Readonly<Record<string, never>>;

/** Net nodes: 0 ground (and the + input), 1 input, A the junction of R1, R2, C1, C2, N the − input. */
const A = 2;
const N = 3;
const OUT = 4;

const placed: readonly PlacedPart[] = [
  { role: 'R1', a: 1, b: A, type: 'R' },
  { role: 'R2', a: A, b: 0, type: 'R' },
  { role: 'C1', a: A, b: N, type: 'C' },
  { role: 'C2', a: A, b: OUT, type: 'C' },
  { role: 'R3', a: OUT, b: N, type: 'R' },
];

/**
 * Ideal figures (DESIGN §3; the multiple-feedback band-pass of the op-amp filter
 * literature): f0 = (1/2π)·√((R1+R2)/(R1·R2·R3·C1·C2)), Q = 2π·f0·R3·C1·C2/(C1+C2),
 * gain at f0 = −R3·C1/(R1·(C1+C2)).
 */
export function mfbIdeal(v: Readonly<Record<string, number>>): { f0: number; q: number; gain: number } {
  const r1 = v['R1'] ?? Number.NaN;
  const r2 = v['R2'] ?? Number.NaN;
  const r3 = v['R3'] ?? Number.NaN;
  const c1 = v['C1'] ?? Number.NaN;
  const c2 = v['C2'] ?? Number.NaN;
  const f0 = Math.sqrt((r1 + r2) / (r1 * r2 * r3 * c1 * c2)) / (2 * Math.PI);
  return { f0, q: (2 * Math.PI * f0 * r3 * c1 * c2) / (c1 + c2), gain: (-r3 * c1) / (r1 * (c1 + c2)) };
}

function evaluate(input: EvalInput<MfbBandpassSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('mfb-bandpass: no input waveform; the plan must name an "input"');
  const ideal = mfbIdeal(input.parts);
  const n = source.samples.length;
  const target = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const warnings: StageWarning[] = [];
  const fault = input.fault;
  const net = buildNet(5, placed, input.parts, fault, { out: OUT, plus: 0, minus: N });
  // Healthy, the section is always stable (negative feedback only); with R3 open the − input
  // has no DC path at all and the op-amp drifts to a rail on its own offset and bias current.
  const behaviour = netStability(net, input.opamp, 2 * Math.PI * ideal.f0);
  if (behaviour.kind !== 'stable') {
    const { high, low } = swing(input.opamp, input.supplies);
    const isOscillating = behaviour.kind === 'oscillates';
    for (let i = 0; i < n; i++) target[i] = isOscillating && i >= n / 2 ? low : high;
    if (!input.isTrial)
      warnings.push({
        message: isOscillating
          ? 'the section is unstable with this fault: it oscillates between the rails'
          : 'the op-amp has no DC feedback (R3 open or the like) and drifts to a rail',
      });
    const values = { f0: Number.NaN, q: Number.NaN, bw: Number.NaN, gain: Number.NaN, 'out.vpp': isOscillating ? high - low : 0 };
    return {
      outputs: { out: { frequency: isOscillating ? behaviour.frequency : 0, samples: isOscillating ? target : target.subarray(0, 1) } },
      values,
      warnings,
    };
  }
  const figures = filterFigures(net, OUT, input.opamp, 'bandpass', ideal.f0, input.isTrial ? 1e-6 : 1e-10);
  const out = applyResponse(source.samples, source.frequency, figures.response, target);
  const limited = limitOutput(out, source.frequency, input.opamp, input.supplies, input.isTrial === true);
  if (!input.isTrial) {
    warnings.push(...limited.warnings);
    const shift = Math.max(Math.abs(figures.f0 / ideal.f0 - 1), Math.abs(figures.q / ideal.q - 1));
    if (!fault && shift > 0.02) {
      // The section needs an open-loop gain well above 2·Q² at f0 (op-amp filter literature, from memory).
      warnings.push({
        message: `the op-amp's gain-bandwidth (${formatValue(input.opamp.gbw, 'Hz')}) moves f0 from ${formatValue(ideal.f0, 'Hz')} to ${formatValue(figures.f0, 'Hz')} and Q from ${ideal.q.toPrecision(3)} to ${figures.q.toPrecision(3)}; an op-amp of ${formatValue(100 * 2 * ideal.q * ideal.q * ideal.f0, 'Hz')} or more brings them back to the design`,
      });
    }
  }
  return {
    outputs: { out: { frequency: source.frequency, samples: out } },
    values: { f0: figures.f0, q: figures.q, bw: figures.bw, gain: figures.gain, 'out.vpp': limited.hi - limited.lo },
    warnings,
  };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'f0',
    quantity: 'centre frequency (peak)',
    unit: 'Hz',
    output: 'out',
    instrument: 'scope',
    how: 'small sine in, tune the generator for the largest output (the output is then in antiphase with the input); read the generator',
  },
  {
    key: 'q',
    quantity: 'Q (f0 over bandwidth, a plain ratio)',
    unit: 'V/V',
    output: 'out',
    instrument: 'scope',
    how: 'f0 divided by the bandwidth between the two −3 dB points',
  },
  {
    key: 'bw',
    quantity: '−3 dB bandwidth',
    unit: 'Hz',
    output: 'out',
    instrument: 'scope',
    how: 'tune the generator below and above f0 to where the output is 0.707 of its peak; the difference of the two readings',
  },
  {
    key: 'gain',
    quantity: 'gain at f0 (negative: inverted)',
    unit: 'V/V',
    output: 'out',
    instrument: 'scope',
    how: 'output over input peak-to-peak at f0, small signal so nothing clips; negative, the output is inverted',
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

const faults: readonly PartFaults[] = [
  { role: 'R1', modes: ['open', 'short'], description: 'input resistor' },
  { role: 'R2', modes: ['open', 'short'], description: 'resistor from node A to ground' },
  { role: 'R3', modes: ['open', 'short'], description: 'feedback resistor, output to − input' },
  { role: 'C1', modes: ['open', 'short'], description: 'capacitor from node A to the − input' },
  { role: 'C2', modes: ['open', 'short'], description: 'capacitor from node A to the output' },
];

export const mfbBandpassKind: StageKind<MfbBandpassSettings> = {
  kind: 'mfb-bandpass',
  summary:
    'multiple-feedback band-pass (inverting): centre f0, Q and gain −R3·C1/(R1·(C1+C2)) at f0, with the op-amp gain-bandwidth (Q rises and f0 falls on a slow op-amp), swing and slew',
  roles: [
    { role: 'R1', unit: 'Ω', description: 'input resistor, to node A' },
    { role: 'R2', unit: 'Ω', description: 'resistor from node A to ground (sets f0 without changing Q much)' },
    { role: 'R3', unit: 'Ω', description: 'feedback resistor, output to − input' },
    { role: 'C1', unit: 'F', description: 'capacitor from node A to the − input' },
    { role: 'C2', unit: 'F', description: 'capacitor from node A to the output' },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const p = nested(reader(raw, file), 'parts', true);
    onlyKeys(p, ['R1', 'R2', 'R3', 'C1', 'C2']);
    const r = (role: string, example: string) => partAt(p, role, 'Ω', true, { positive: true, plausible: ohmRange, example });
    // Above 1 F is a missing prefix or an RKM slip ("10k"), not a filter capacitor.
    const c = (role: string) => partAt(p, role, 'F', true, { positive: true, plausible: [1e-15, 1], example: '"10n 5%"' });
    const parts: Record<string, PartValue> = { R1: r('R1', '"33k 1%"'), R2: r('R2', '"4k7 1%"'), R3: r('R3', '"62k 1%"'), C1: c('C1'), C2: c('C2') };
    return { parts, settings: {} };
  },
  checks: () => checks,
  evaluate,
  traits: { usesOpamp: true },
  inputImpedance(x, f) {
    const net = buildNet(5, placed, x.parts, undefined, { out: OUT, plus: 0, minus: N });
    net.solve(f, x.opamp);
    // Z = R1 / (1 − V(A)) with 1 V at the input.
    const r1 = x.parts['R1'] ?? Number.NaN;
    const dr = 1 - (net.re[A] as number);
    const di = -(net.im[A] as number);
    const d = dr * dr + di * di;
    return { re: (r1 * dr) / d, im: (-r1 * di) / d };
  },
  faults: () => faults,
  faultHints: {
    f0: [
      'a capacitor a decade off (1n or 100n fitted for 10n): f0 moves by √10',
      'R2 the wrong value: f0 moves, the gain at f0 stays',
      'a slower op-amp than the plan assumes: f0 falls and Q rises when GBW is not far above 2·Q²·f0',
    ],
    q: ['R3 the wrong value: Q follows R3', 'C1 and C2 of different values swapped'],
    bw: ['read f0 and Q first: the bandwidth is f0/Q'],
    gain: [
      'R1 the wrong value: the gain at f0 follows R3/R1',
      'R3 shorted: no output',
      'R3 open: the output sits at a rail',
      'the input level is off: check the upstream stage',
    ],
    'out.vpp': [
      'the input level is off: check the upstream stage first',
      'the signal is off f0: a band-pass passes little away from its centre',
      'clipping: at high Q the gain at f0 can drive the output into the rails',
    ],
  },
};
