import { isOpen, loadedShare, resistance } from './complex.js';
import { applyResponse } from './response.js';
import { choiceAt, nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartValue, StageKind } from './types.js';
import { defaultSamples, extremes } from './waveform.js';

export type SignalShape = 'sine' | 'triangle' | 'square';

/**
 * A bench generator's signal injected at a connector. Its `peak`, `frequency` and
 * `offset` are toleranced settings (roles of the same names), so a generator's
 * setting accuracy flows down the chain like any part's tolerance.
 */
export interface SignalInSettings {
  readonly shape: SignalShape;
  readonly hasOffset: boolean;
  /**
   * Whether the plan gives the generator's output impedance (`"source": "50 ohm 1%"`):
   * `peak` is then the open-circuit amplitude and the connector sees it divided by
   * the source and the board's input impedance. Absent: an ideal source.
   */
  readonly hasSource?: boolean;
}

/** One period of the unit shape at phase p (0 ≤ p < 1); zero-crossing rising at p = 0. */
function unitShape(shape: SignalShape, p: number): number {
  if (shape === 'sine') return Math.sin(2 * Math.PI * p);
  if (shape === 'square') return p < 0.5 ? 1 : -1;
  return p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4;
}

function evaluate(input: EvalInput<SignalInSettings>): EvalOutput {
  const peak = input.parts['peak'] ?? Number.NaN;
  const frequency = input.parts['frequency'] ?? Number.NaN;
  const offset = input.settings.hasOffset ? (input.parts['offset'] ?? Number.NaN) : 0;
  let samples: Float64Array = new Float64Array(defaultSamples);
  for (let i = 0; i < samples.length; i++) samples[i] = offset + peak * unitShape(input.settings.shape, i / samples.length);
  const rs = input.settings.hasSource ? (input.parts['source'] ?? Number.NaN) : 0;
  const load = input.load;
  let level = offset;
  if (rs > 0 && load) {
    // The connector is the divider the source resistance makes with the board's input,
    // harmonic by harmonic: v = v_open · ZL/(Rs + ZL) (Thevenin source into a load).
    const zs = resistance(rs);
    samples = applyResponse(samples, frequency, (f) => loadedShare(zs, load('out', f)));
    const z0 = load('out', 0);
    level = z0 === undefined || isOpen(z0) ? offset : offset * loadedShare(zs, z0).re;
  }
  const { hi, lo } = extremes(samples);
  const values: Record<string, number> = { 'out.vpp': hi - lo, freq: frequency };
  if (input.settings.hasOffset) values['out.dc'] = level;
  return { outputs: { out: { frequency, samples } }, values, warnings: [] };
}

function checks(settings: SignalInSettings): readonly CheckSpec[] {
  const list: CheckSpec[] = [
    {
      key: 'out.vpp',
      captureFigure: 'vpp',
      quantity: 'peak-to-peak',
      unit: 'V',
      output: 'out',
      instrument: 'scope',
      how: 'scope at the input connector with the generator connected: generators that show amplitude into 50 Ω read double into a high-impedance input',
    },
    {
      key: 'freq',
      captureFigure: 'frequency',
      quantity: 'frequency',
      unit: 'Hz',
      output: 'out',
      instrument: 'counter',
      how: 'counter or scope frequency readout at the input connector',
    },
  ];
  if (settings.hasOffset) {
    list.push({
      key: 'out.dc',
      captureFigure: 'mean',
      quantity: 'DC offset',
      unit: 'V',
      output: 'out',
      instrument: 'meter',
      how: 'DC voltmeter (or the scope mean) at the input connector',
    });
  }
  return list;
}

export const signalInKind: StageKind<SignalInSettings> = {
  kind: 'signal-in',
  summary: 'test signal from a bench generator at an input connector (sine, triangle or square)',
  traits: { usesOpamp: false, isAmplifier: false, isHandWritten: false },
  roles: [
    { role: 'peak', unit: 'V', description: 'generator amplitude, zero to peak' },
    { role: 'frequency', unit: 'Hz', description: 'generator frequency' },
    { role: 'offset', unit: 'V', description: 'generator DC offset', optional: true },
    { role: 'source', unit: 'Ω', description: 'generator output impedance (peak is then the open-circuit amplitude)', optional: true },
  ],
  outputs: ['out'],
  needsInput: false,
  parse(raw, file) {
    const r = reader(raw, file);
    const parts: Record<string, PartValue> = {
      peak: partAt(r, 'peak', 'V', true, { positive: true, example: '"1 V 2%"' }),
      frequency: partAt(r, 'frequency', 'Hz', true, { positive: true, example: '"1 kHz 0.1%"' }),
    };
    const offset = partAt(r, 'offset', 'V', false, { example: '"0.5 V"' });
    if (offset) parts['offset'] = offset;
    const source = partAt(r, 'source', 'Ω', false, { positive: true, plausible: ohmRange, example: '"50 ohm 1%"' });
    if (source) parts['source'] = source;
    if (raw.json['parts'] !== undefined) onlyKeys(nested(r, 'parts'), []);
    return {
      parts,
      settings: { shape: choiceAt(r, 'shape', ['sine', 'triangle', 'square'] as const), hasOffset: offset !== undefined, hasSource: source !== undefined },
    };
  },
  checks,
  evaluate,
  // The generator's output impedance as the plan gives it; an ideal source without one.
  outputImpedance: (x) => ({ re: x.settings.hasSource ? (x.parts['source'] ?? 0) : 0, im: 0 }),
  faultHints: {
    'out.vpp': [
      'the generator amplitude set as peak-to-peak instead of peak (or the reverse)',
      'the generator set for a 50 Ω load: into a high-impedance input it reads double',
      'the input connector loaded or shorted on the board',
    ],
    freq: ['the generator set to the wrong frequency or range'],
    'out.dc': ['the generator offset not set, or the input AC-coupled on the board'],
  },
};
