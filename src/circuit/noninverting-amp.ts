import { amplifierChecks, amplifierHints, evaluateAmplifier } from './amplifier.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import { faultedParts, resistorFaults } from './faults.js';
import type { EvalInput, EvalOutput, PartValue, StageKind } from './types.js';

/** A non-inverting gain stage has no settings beyond its parts. */
export type NoninvertingAmpSettings = Readonly<Record<string, never>>;

function evaluate(input: EvalInput<NoninvertingAmpSettings>): EvalOutput {
  // An open or shorted resistor is a huge or tiny one: the same equations carry it (Rg open: a follower).
  const parts = faultedParts(input, ['Rg', 'Rf']);
  const rg = parts['Rg'] ?? Number.NaN;
  const rf = parts['Rf'] ?? Number.NaN;
  // Gain 1 + Rf/Rg, equal to its noise gain (Sedra and Smith, the non-inverting configuration).
  const g = 1 + rf / rg;
  return evaluateAmplifier({ ideal: g, noiseGain: g, rf }, input, 'noninverting-amp');
}

export const noninvertingAmpKind: StageKind<NoninvertingAmpSettings> = {
  kind: 'noninverting-amp',
  summary: 'non-inverting op-amp gain stage: gain 1 + Rf/Rg, bandwidth GBW/(1 + Rf/Rg), clipping and slew from the op-amp',
  traits: { usesOpamp: true, isAmplifier: true, isHandWritten: false },
  roles: [
    { role: 'Rg', unit: 'Ω', description: 'resistor from the inverting input to ground' },
    { role: 'Rf', unit: 'Ω', description: 'feedback resistor, from the output to the inverting input' },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const p = nested(reader(raw, file), 'parts', true);
    onlyKeys(p, ['Rg', 'Rf']);
    const parts: Record<string, PartValue> = {
      Rg: partAt(p, 'Rg', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
      Rf: partAt(p, 'Rf', 'Ω', true, { positive: true, plausible: ohmRange, example: '"22k 1%"' }),
    };
    return { parts, settings: {} };
  },
  checks: () => amplifierChecks,
  evaluate,
  faults: () => resistorFaults(['Rg', 'Rf'], { Rg: 'gain resistor to ground', Rf: 'feedback resistor' }),
  faultHints: {
    gain: [
      'Rf and Rg swapped: 1 + Rg/Rf instead of 1 + Rf/Rg',
      'Rg open or not fitted: the stage is a unity-gain follower (gain 1)',
      'Rf shorted (solder bridge): gain 1',
      'a ×10 slip on Rf or Rg',
    ],
    ...amplifierHints,
  },
};
