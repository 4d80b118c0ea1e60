import { StageParseError } from './errors.js';
import { formatValue } from '../units/format.js';
import { dcLoad, railOf } from './rail-load.js';
import { choiceAt, nested, ohmRange, onlyKeys, partAt, reader, textAt } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';
import { dc } from './waveform.js';

export interface RegulatorSettings {
  /** Rail id the regulator's input hangs from (`+15V`). */
  readonly from: string;
  /** `+` a positive regulator, `-` a negative one (its mirror image). */
  readonly polarity: '+' | '-';
  /** A fixed regulator (`vout`, no R1/R2). */
  readonly isFixed: boolean;
}

/**
 * Output current below which a three-terminal adjustable stops regulating and
 * its output drifts up: a few mA (data sheets of the common adjustables give
 * about 3.5 mA typical, 10 mA worst; from memory). Only a warning.
 */
const minimumLoad = 3.5e-3;

/** Dissipation above which a regulator in a TO-220 package needs a heat sink (common practice, no source). */
const hotPackage = 1;

/** Magnitude of the regulated output the parts ask for, before any dropout; Infinity when it rises out of regulation. */
function setPoint(input: EvalInput<RegulatorSettings>): number {
  const p = input.parts;
  if (input.settings.isFixed) return p['vout'] ?? Number.NaN;
  const r1 = p['R1'] ?? Number.NaN;
  const r2 = p['R2'] ?? Number.NaN;
  const vref = p['vref'] ?? Number.NaN;
  const iadj = p['iadj'] ?? Number.NaN;
  const fault = input.fault;
  // R2 shorted puts the adjust pin at ground: the output sits at the reference.
  if (fault?.role === 'R2' && fault.mode === 'short') return vref;
  // R1 open or shorted, or R2 open: the error amplifier never sees its reference
  // across R1 and turns the pass transistor fully on (the output rises to the input less the dropout).
  if (fault && ((fault.role === 'R1' && (fault.mode === 'open' || fault.mode === 'short')) || (fault.role === 'R2' && fault.mode === 'open'))) {
    return Number.POSITIVE_INFINITY;
  }
  // Adjustable three-terminal regulator: Vout = Vref·(1 + R2/R1) + Iadj·R2 (the form printed in their data sheets).
  return vref * (1 + r2 / r1) + iadj * r2;
}

function evaluate(input: EvalInput<RegulatorSettings>): EvalOutput {
  const { settings } = input;
  const sign = settings.polarity === '-' ? -1 : 1;
  const vin = railOf('regulator', input, settings.from);
  if (sign * vin <= 0) {
    throw new Error(
      `regulator: a ${settings.polarity === '-' ? 'negative' : 'positive'} regulator fed from rail ${JSON.stringify(settings.from)} at ${formatValue(vin, 'V')}; feed it from a ${settings.polarity === '-' ? 'negative' : 'positive'} rail or set "polarity"`,
    );
  }
  const dropout = input.parts['dropout'] ?? Number.NaN;
  const want = setPoint(input);
  // In dropout the output follows the input less the dropout (DESIGN §3), fixed regulators too.
  const ceiling = Math.max(0, Math.abs(vin) - dropout);
  const isDropout = !(want <= ceiling);
  const magnitude = isDropout ? ceiling : want;
  const vout = sign * magnitude;
  // Current out of the regulator: its own divider (R1 + R2) and whatever loads the output at DC.
  const divider = settings.isFixed ? 0 : magnitude / ((input.parts['R1'] ?? Number.NaN) + (input.parts['R2'] ?? Number.NaN));
  const current = divider + magnitude * dcLoad(input, 'out');
  const pdiss = (Math.abs(vin) - magnitude) * current;
  const values = { 'out.dc': vout, pdiss };
  if (input.isTrial) return { outputs: { out: dc(vout) }, values, warnings: [] };
  const warnings: StageWarning[] = [];
  if (isDropout) {
    warnings.push({
      message: Number.isFinite(want)
        ? `in dropout: the ${formatValue(vin, 'V')} input is less than ${formatValue(dropout, 'V')} above the ${formatValue(sign * want, 'V')} it should regulate to, so the output follows the input at about ${formatValue(vout, 'V')}`
        : `out of regulation: the output rises to the input less the dropout, about ${formatValue(vout, 'V')}`,
    });
  }
  if (!settings.isFixed && Number.isFinite(want) && current < minimumLoad) {
    warnings.push({
      message: `only ${formatValue(current, 'A')} flows out of the regulator (R1 + R2 and the load); adjustable regulators need a few mA (about ${formatValue(minimumLoad, 'A')}) or the output creeps up: make R1 smaller (240 Ω is usual)`,
    });
  }
  if (pdiss > hotPackage) {
    warnings.push({
      message: `the regulator dissipates ${formatValue(pdiss, 'W')}: it runs hot enough to burn a finger without a heat sink; let it cool before touching it after power-off`,
    });
  }
  return { outputs: { out: dc(vout) }, values, warnings };
}

const checks: readonly CheckSpec[] = [
  {
    key: 'out.dc',
    quantity: 'regulated output',
    unit: 'V',
    output: 'out',
    instrument: 'meter',
    how: 'DC voltmeter from the regulator output to ground, the board otherwise idle',
    captureFigure: 'mean',
  },
  {
    key: 'pdiss',
    quantity: 'regulator dissipation (input − output) × current',
    unit: 'W',
    instrument: 'meter',
    how: 'design figure: the input-to-output drop times the current out of the regulator (its divider and the loads); not probed',
    isDesignFigure: true,
  },
];

function faults(settings: RegulatorSettings): readonly PartFaults[] {
  if (settings.isFixed) return [];
  return [
    { role: 'R1', modes: ['open', 'short'], description: 'resistor from the output to the adjust pin' },
    { role: 'R2', modes: ['open', 'short'], description: 'resistor from the adjust pin to ground' },
  ];
}

export const regulatorKind: StageKind<RegulatorSettings> = {
  kind: 'regulator',
  summary: 'three-terminal regulator from a rail: Vref·(1 + R2/R1) + Iadj·R2 (or a fixed vout), positive or negative, with dropout',
  roles: [
    { role: 'R1', unit: 'Ω', description: 'resistor from the output to the adjust pin', optional: true },
    { role: 'R2', unit: 'Ω', description: 'resistor from the adjust pin to ground', optional: true },
    { role: 'vref', unit: 'V', description: 'reference between output and adjust pin', optional: true, isRating: true },
    { role: 'iadj', unit: 'A', description: 'current out of the adjust pin', optional: true, isRating: true },
    { role: 'dropout', unit: 'V', description: 'least input-to-output difference it regulates at', optional: true, isRating: true },
    { role: 'vout', unit: 'V', description: 'output of a fixed regulator', optional: true },
  ],
  outputs: ['out'],
  needsInput: false,
  traits: { railSetting: 'from' },
  parse(raw, file) {
    const r = reader(raw, file);
    const from = textAt(r, 'from', true, '"+15V" (the rail id feeding the regulator input)');
    const vout = partAt(r, 'vout', 'V', false, { example: '"5 V 4%"', plausible: [-60, 60] });
    const parts: Record<string, PartValue> = {};
    let polarity = choiceAt(r, 'polarity', ['+', '-'] as const, vout && vout.nominal < 0 ? '-' : '+');
    if (vout) {
      if (raw.json['parts'] !== undefined) onlyKeys(nested(r, 'parts'), []);
      for (const key of ['vref', 'iadj']) {
        if (raw.json[key] !== undefined)
          throw new StageParseError(file, `${r.path}.${key}`, `a fixed regulator ("vout") has no ${key}; remove it, or give R1 and R2 instead of "vout"`);
      }
      if (vout.nominal === 0)
        throw new StageParseError(file, `${r.path}.vout`, `${JSON.stringify(vout.text)} is not a regulator output; write e.g. "5 V 4%" or "-5 V 4%"`);
      if (polarity === '+' && vout.nominal < 0)
        throw new StageParseError(
          file,
          `${r.path}.polarity`,
          `"+" with a negative vout ${JSON.stringify(vout.text)}; write "polarity": "-" or a positive vout`,
        );
      polarity = vout.nominal < 0 ? '-' : polarity;
      parts['vout'] = { ...vout, nominal: Math.abs(vout.nominal) };
    } else {
      const p = nested(r, 'parts', true);
      onlyKeys(p, ['R1', 'R2']);
      parts['R1'] = partAt(p, 'R1', 'Ω', true, { positive: true, plausible: ohmRange, example: '"240 1%"' });
      parts['R2'] = partAt(p, 'R2', 'Ω', true, { positive: true, plausible: ohmRange, example: '"720 1%"' });
      // The reference and adjust current are magnitudes; a negative regulator mirrors them (DESIGN §3).
      parts['vref'] = partAt(r, 'vref', 'V', false, { positive: true, plausible: [0.5, 5], example: '"1.25 V 4%"' }) ?? {
        nominal: 1.25,
        tol: 0.04,
        unit: 'V',
        text: '1.25 V 4% (default)',
      };
      parts['iadj'] = partAt(r, 'iadj', 'A', false, { nonNegative: true, plausible: [0, 1e-3], example: '"50 uA"' }) ?? {
        nominal: 50e-6,
        tol: 0,
        unit: 'A',
        text: '50 uA (default)',
      };
    }
    parts['dropout'] = partAt(r, 'dropout', 'V', false, { nonNegative: true, plausible: [0, 10], example: '"2 V"' }) ?? {
      nominal: 2,
      tol: 0,
      unit: 'V',
      text: '2 V (default)',
    };
    return { parts, settings: { from, polarity, isFixed: vout !== undefined } };
  },
  checks: () => checks,
  evaluate,
  // An output inside regulation is a near-ideal source (load regulation of a few mΩ, common practice).
  outputImpedance: () => ({ re: 0, im: 0 }),
  faults,
  faultHints: {
    'out.dc': [
      'R1 and R2 swapped: the output reads Vref·(1 + R1/R2) instead (about 1.6 V for a 5 V design)',
      'output at the input less about 2 V: R1 or R2 open, or the adjust pin not soldered',
      'output at about 1.25 V: R2 shorted, or the adjust pin bridged to ground',
      'output near the input rail and the regulator hot: input and output pins swapped, or the wrong pinout (the negative and positive types differ)',
      'the input rail itself low: check the rail reading first (dropout)',
      'a heavy or shorted load downstream: the regulator runs hot or goes into current limit',
    ],
    pdiss: ['a heavy or shorted load downstream: the regulator runs hot or goes into current limit'],
  },
};
