import { choiceAt, nested, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartValue, StageKind } from './types.js';
import { defaultSamples } from './waveform.js';

export type SignalShape = 'sine' | 'triangle' | 'square';

/**
 * A bench generator's signal injected at a connector. Its `peak`, `frequency` and
 * `offset` are toleranced settings (roles of the same names), so a generator's
 * setting accuracy flows down the chain like any part's tolerance.
 */
export interface SignalInSettings {
  readonly shape: SignalShape;
  readonly hasOffset: boolean;
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
  const samples = new Float64Array(defaultSamples);
  for (let i = 0; i < samples.length; i++) samples[i] = offset + peak * unitShape(input.settings.shape, i / samples.length);
  const values: Record<string, number> = { 'out.vpp': 2 * Math.abs(peak), freq: frequency };
  if (input.settings.hasOffset) values['out.dc'] = offset;
  return { outputs: { out: { frequency, samples } }, values, warnings: [] };
}

function checks(settings: SignalInSettings): readonly CheckSpec[] {
  const list: CheckSpec[] = [
    { key: 'out.vpp', captureFigure: 'vpp', quantity: 'peak-to-peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope at the input connector with the generator connected: generators that show amplitude into 50 Ω read double into a high-impedance input' },
    { key: 'freq', captureFigure: 'frequency', quantity: 'frequency', unit: 'Hz', output: 'out', instrument: 'counter', how: 'counter or scope frequency readout at the input connector' },
  ];
  if (settings.hasOffset) {
    list.push({ key: 'out.dc', captureFigure: 'mean', quantity: 'DC offset', unit: 'V', output: 'out', instrument: 'meter', how: 'DC voltmeter (or the scope mean) at the input connector' });
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
    if (raw.json['parts'] !== undefined) onlyKeys(nested(r, 'parts'), []);
    return { parts, settings: { shape: choiceAt(r, 'shape', ['sine', 'triangle', 'square'] as const), hasOffset: offset !== undefined } };
  },
  checks,
  evaluate,
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
