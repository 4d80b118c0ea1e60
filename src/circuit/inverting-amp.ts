import { amplifierChecks, amplifierHints, evaluateAmplifier } from './amplifier.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { EvalInput, EvalOutput, PartValue, StageKind } from './types.js';

/** An inverting gain stage has no settings beyond its parts. */
export type InvertingAmpSettings = Readonly<Record<string, never>>;

function evaluate(input: EvalInput<InvertingAmpSettings>): EvalOutput {
  const rin = input.parts['Rin'] ?? Number.NaN;
  const rf = input.parts['Rf'] ?? Number.NaN;
  // Gain −Rf/Rin, noise gain 1 + Rf/Rin (Sedra and Smith, the inverting configuration).
  return evaluateAmplifier({ ideal: -rf / rin, noiseGain: 1 + rf / rin }, input, 'inverting-amp');
}

export const invertingAmpKind: StageKind<InvertingAmpSettings> = {
  kind: 'inverting-amp',
  summary: 'inverting op-amp gain stage: gain −Rf/Rin, bandwidth GBW/(1 + Rf/Rin), clipping and slew from the op-amp',
  traits: { usesOpamp: true, isAmplifier: true, isHandWritten: false },
  roles: [
    { role: 'Rin', unit: 'Ω', description: 'input resistor, from the input to the inverting input' },
    { role: 'Rf', unit: 'Ω', description: 'feedback resistor, from the output to the inverting input' },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const p = nested(reader(raw, file), 'parts', true);
    onlyKeys(p, ['Rin', 'Rf']);
    const parts: Record<string, PartValue> = {
      Rin: partAt(p, 'Rin', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
      Rf: partAt(p, 'Rf', 'Ω', true, { positive: true, plausible: ohmRange, example: '"33k 1%"' }),
    };
    return { parts, settings: {} };
  },
  checks: () => amplifierChecks,
  evaluate,
  faultHints: {
    gain: [
      'Rf and Rin swapped: the gain reads as 1/gain (−0.3 instead of −3.3)',
      'a ×10 slip on Rf or Rin (33k fitted for 3k3)',
      'Rf open: the output sits at a rail (open-loop gain)',
      'a positive reading: probe or channel inverted, or the stage wired non-inverting',
    ],
    ...amplifierHints,
  },
};
