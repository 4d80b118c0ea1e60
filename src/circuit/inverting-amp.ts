import { amplifierChecks, amplifierHints, evaluateAmplifier } from './amplifier.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import { faultedParts, resistorFaults } from './faults.js';
import type { Complex, EvalInput, EvalOutput, ImpedanceInput, PartValue, StageKind } from './types.js';

/** An inverting gain stage has no settings beyond its parts. */
export type InvertingAmpSettings = Readonly<Record<string, never>>;

function evaluate(input: EvalInput<InvertingAmpSettings>): EvalOutput {
  // An open or shorted resistor is a huge or tiny one: the same equations carry it (Rf open: open loop, clipped).
  const parts = faultedParts(input, ['Rin', 'Rf']);
  const rin = parts['Rin'] ?? Number.NaN;
  const rf = parts['Rf'] ?? Number.NaN;
  // Gain −Rf/Rin, noise gain 1 + Rf/Rin (Sedra and Smith, the inverting configuration).
  return evaluateAmplifier({ ideal: -rf / rin, noiseGain: 1 + rf / rin, rf }, input, 'inverting-amp');
}

/**
 * The source sees Rin into the inverting input, which is a virtual ground only
 * as far as the op-amp has loop gain: Zin = Rin + Rf/(1 + A(jf)) with the
 * single-pole open-loop gain A(jf) = aol/(1 + j·f·aol/GBW) (Sedra and Smith,
 * the inverting configuration with finite gain). Near the amplifier's own
 * bandwidth Rf/(1 + A) grows and turns inductive; at audio frequencies it is a
 * few ohms. Valid while the output does not clip (a clipped stage has no
 * virtual ground at all).
 */
function inputImpedance(x: ImpedanceInput<InvertingAmpSettings>, f: number): Complex {
  const rin = x.parts['Rin'] ?? Number.NaN;
  const rf = x.parts['Rf'] ?? Number.NaN;
  const { aol, gbw } = x.opamp;
  const w = f * (aol / gbw);
  // Rf·(1 + jw)/(1 + aol + jw), w = f/fp.
  const d = (1 + aol) * (1 + aol) + w * w;
  return { re: rin + (rf * (1 + aol + w * w)) / d, im: (rf * (w * (1 + aol) - w)) / d };
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
  faults: () => resistorFaults(['Rin', 'Rf'], { Rin: 'input resistor', Rf: 'feedback resistor' }),
  inputImpedance,
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
