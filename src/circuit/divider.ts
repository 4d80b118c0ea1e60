import { nested, ohmRange, onlyKeys, partAt, reader, textAt } from './stage-parse.js';
import { faultedParts, resistorFaults } from './faults.js';
import type { CheckSpec, EvalInput, EvalOutput, PartValue, StageKind } from './types.js';
import { dc } from './waveform.js';

export interface DividerSettings {
  /** Rail id the divider hangs from (`+12V`). */
  readonly from: string;
}

function evaluate(input: EvalInput<DividerSettings>): EvalOutput {
  const rail = input.rails[input.settings.from];
  // `parse` cannot see the plan's rails: an unknown rail id surfaces here, as a stage that cannot be evaluated.
  if (rail === undefined) {
    const known = Object.keys(input.rails)
      .map((id) => JSON.stringify(id))
      .join(', ');
    throw new Error(`divider: "from" names rail ${JSON.stringify(input.settings.from)}, which the plan does not have (rails: ${known || 'none'})`);
  }
  const parts = faultedParts(input, ['Rtop', 'Rbottom']);
  const top = parts['Rtop'] ?? Number.NaN;
  const bottom = parts['Rbottom'] ?? Number.NaN;
  // Unloaded resistive divider: V · Rbottom / (Rtop + Rbottom); loaded, that open-circuit
  // level behind its Thevenin resistance Rtop‖Rbottom into the load's DC resistance.
  const open = (rail * bottom) / (top + bottom);
  const zl = input.load?.('out', 0);
  const rl = zl === undefined || !Number.isFinite(zl.re) ? Number.POSITIVE_INFINITY : zl.re;
  const level = Number.isFinite(rl) ? (open * rl) / ((top * bottom) / (top + bottom) + rl) : open;
  return { outputs: { out: dc(level) }, values: { 'out.dc': level }, warnings: [] };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'out.dc',
    captureFigure: 'mean',
    quantity: 'DC level',
    unit: 'V',
    output: 'out',
    instrument: 'meter',
    how: 'DC voltmeter from the divider tap to ground (a 10 MΩ meter input loads dividers above about 100 kΩ)',
  },
];

export const dividerKind: StageKind<DividerSettings> = {
  kind: 'divider',
  summary: 'resistive divider from a rail: DC level Rbottom/(Rtop + Rbottom) of the rail',
  traits: { usesOpamp: false, isAmplifier: false, railSetting: 'from', isHandWritten: false },
  roles: [
    { role: 'Rtop', unit: 'Ω', description: 'resistor from the rail to the tap' },
    { role: 'Rbottom', unit: 'Ω', description: 'resistor from the tap to ground' },
  ],
  outputs: ['out'],
  needsInput: false,
  parse(raw, file) {
    const r = reader(raw, file);
    const p = nested(r, 'parts', true);
    onlyKeys(p, ['Rtop', 'Rbottom']);
    const parts: Record<string, PartValue> = {
      Rtop: partAt(p, 'Rtop', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
      Rbottom: partAt(p, 'Rbottom', 'Ω', true, { positive: true, plausible: ohmRange, example: '"4k7 1%"' }),
    };
    return { parts, settings: { from: textAt(r, 'from', true, '"+12V" (a rail id)') } };
  },
  checks: () => checks,
  evaluate,
  faults: () => resistorFaults(['Rtop', 'Rbottom'], { Rtop: 'upper divider resistor', Rbottom: 'lower divider resistor' }),
  // Thevenin resistance of the tap: Rtop ‖ Rbottom (the rail an ideal source).
  outputImpedance: (x) => {
    const top = x.parts['Rtop'] ?? Number.NaN;
    const bottom = x.parts['Rbottom'] ?? Number.NaN;
    return { re: (top * bottom) / (top + bottom), im: 0 };
  },
  faultHints: {
    'out.dc': [
      'the rail itself is off: check the rail reading first',
      'Rtop and Rbottom swapped: the tap reads Rtop/(Rtop + Rbottom) of the rail instead',
      'a ×10 slip on one resistor',
      'something downstream loading the tap, or the meter on a high-value divider',
    ],
  },
};
