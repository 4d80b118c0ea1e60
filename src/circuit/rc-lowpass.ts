import { singlePole } from './single-pole.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import { extremes } from './waveform.js';
import type { CheckSpec, EvalInput, EvalOutput, PartValue, StageKind } from './types.js';

/** A passive RC low-pass has no settings beyond its parts. */
export type RcLowpassSettings = Readonly<Record<string, never>>;

function evaluate(input: EvalInput<RcLowpassSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('rc-lowpass: no input waveform; the plan must name an "input"');
  const r = input.parts['R'] ?? Number.NaN;
  const c = input.parts['C'] ?? Number.NaN;
  // Corner of a first-order RC section: fc = 1 / (2π·R·C) (any circuits handbook).
  const fc = 1 / (2 * Math.PI * r * c);
  // Unloaded output: every harmonic attenuated as 1/(1 + j·f/fc) (see single-pole.ts).
  const out = singlePole(source.samples, source.frequency, fc);
  const { hi, lo } = extremes(out);
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values: { fc, 'out.vpp': hi - lo }, warnings: [] };
}

const checks: readonly CheckSpec[] = [
  { key: 'fc', quantity: '−3 dB corner frequency', unit: 'Hz', output: 'out', instrument: 'scope', how: 'small sine in, raise the generator frequency until the output is 0.707 of the input (45° behind); read the generator' },
  { key: 'out.vpp', captureFigure: 'vpp', quantity: 'peak-to-peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope at the filter output with the chain signal applied, 10× probe (a 1× probe adds about 100 pF), read peak-to-peak' },
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
