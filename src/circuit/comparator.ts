import { formatValue } from '../units/format.js';
import { swing } from './opamp.js';
import { booleanAt } from './parse-extra.js';
import { nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartFaults, PartValue, StageKind, StageWarning } from './types.js';
import { dc, extremes } from './waveform.js';

export interface ComparatorSettings {
  /** The input is a periodic signal: the stage offers `freq` and `duty`. @default true */
  readonly isPeriodic: boolean;
}

interface Thresholds {
  readonly high: number;
  readonly low: number;
  /** Output levels, V. */
  readonly outHigh: number;
  readonly outLow: number;
  /** Feedback fraction R1/(R1 + R2) and the reference's share Vref·R2/(R1 + R2): V+ = base + a·Vout. */
  readonly a: number;
  readonly base: number;
}

/**
 * Thresholds at the (+) input, with the output at either level:
 * V± = (Vref·R2 + Vout±·R1)/(R1 + R2) (Sedra and Smith, the inverting bistable
 * with a reference). Faults move the feedback fraction a = R1/(R1 + R2): R1
 * open or R2 shorted puts the (+) input on the output (a = 1); R2 open or R1
 * shorted on the reference (a = 0, no hysteresis).
 */
/** Output current a general-purpose op-amp delivers before it current-limits, A (common practice, no source). */
const currentLimit = 25e-3;

/**
 * The output levels: the swing (rail less headroom), or less where the load at
 * the output would draw more than the op-amp's current limit (|V| = Ilim·|Z|).
 */
function outputLevels(input: EvalInput<ComparatorSettings>): { high: number; low: number; isLimited: boolean } {
  const { high, low } = swing(input.opamp, input.supplies);
  const z = input.load?.('out', input.input?.frequency ?? 0);
  if (!z) return { high, low, isLimited: false };
  const most = currentLimit * Math.hypot(z.re, z.im);
  return { high: Math.min(high, most), low: Math.max(low, -most), isLimited: most < Math.max(high, -low) };
}

function thresholds(input: EvalInput<ComparatorSettings>): Thresholds {
  const r1 = input.parts['R1'] ?? Number.NaN;
  const r2 = input.parts['R2'] ?? Number.NaN;
  const vref = input.parts['vref'] ?? 0;
  const fault = input.fault;
  let a = r1 / (r1 + r2);
  if (fault && ((fault.role === 'R1' && fault.mode === 'open') || (fault.role === 'R2' && fault.mode === 'short'))) a = 1;
  if (fault && ((fault.role === 'R2' && fault.mode === 'open') || (fault.role === 'R1' && fault.mode === 'short'))) a = 0;
  const { high, low } = outputLevels(input);
  return { high: vref * (1 - a) + high * a, low: vref * (1 - a) + low * a, outHigh: high, outLow: low, a, base: vref * (1 - a) };
}

/**
 * The output over one period of a periodic input: the comparator falls when the
 * input rises through the upper threshold and rises when it falls through the
 * lower one (crossings interpolated between samples), and the output moves
 * between its levels at the op-amp's slew rate from each crossing on. The
 * (+) input follows the output as it is, not as it will be: while an edge is
 * still on its way the threshold is base + a·Vout, so a signal too fast for
 * the edges to finish switches early (ngspice shows the same). Two passes: the
 * first settles the state and the output level, the second is kept.
 */
function periodic(x: Float64Array, th: Thresholds, slewPerPeriod: number, out: Float64Array) {
  const n = x.length;
  let isHigh = !((x[0] as number) > th.high);
  let y = isHigh ? th.outHigh : th.outLow;
  let highTime = 0;
  let falls = 0;
  let rises = 0;
  const step = slewPerPeriod / n;
  for (let pass = 0; pass < 2; pass++) {
    for (let i = 0; i < n; i++) {
      const prev = x[(i + n - 1) % n] as number;
      const cur = x[i] as number;
      // Fraction of this sample step still left after a crossing inside it.
      let left = 1;
      let switched = false;
      const at = th.base + th.a * y;
      if (isHigh && cur > at && prev <= at) {
        left = (cur - at) / (cur - prev);
        isHigh = false;
        switched = true;
      } else if (!isHigh && cur < at && prev >= at) {
        left = (at - cur) / (prev - cur);
        isHigh = true;
        switched = true;
      }
      if (pass === 1) {
        // Time high, counted at the crossings (before the slew): the duty a counter reads at mid-level on full swings.
        highTime += switched ? (isHigh ? left : 1 - left) : isHigh ? 1 : 0;
        if (switched) isHigh ? rises++ : falls++;
      }
      const target = isHigh ? th.outHigh : th.outLow;
      const move = step * (switched ? left : 1);
      y = y < target ? Math.min(target, y + move) : Math.max(target, y - move);
      if (pass === 1) out[i] = y;
    }
  }
  return { duty: highTime / n, cycles: Math.min(falls, rises) };
}

function evaluate(input: EvalInput<ComparatorSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('comparator: no input waveform; the plan must name an "input"');
  const th = thresholds(input);
  const values: Record<string, number> = { 'vth.high': th.high, 'vth.low': th.low, hysteresis: th.high - th.low };
  const warnings: StageWarning[] = [];
  const { lo: inLo, hi: inHi } = extremes(source.samples);
  if (!(source.frequency > 0)) {
    // A DC input: the level decides, and between the thresholds either state holds (taken high, as after power-up with the input low).
    const level = inHi;
    const isHigh = !(level > th.high);
    const v = isHigh ? th.outHigh : th.outLow;
    values['out.vpp'] = 0;
    if (input.settings.isPeriodic) {
      values['freq'] = Number.NaN;
      values['duty'] = Number.NaN;
    }
    if (!input.isTrial) {
      if (level > th.low && level < th.high)
        warnings.push({ message: `the DC input ${formatValue(level, 'V')} lies between the thresholds: the output may rest at either level` });
      if (input.settings.isPeriodic) warnings.push({ message: 'the input is a DC level: no frequency or duty to read; write "periodic": false on this stage' });
    }
    return { outputs: { out: dc(v) }, values, warnings };
  }
  const n = source.samples.length;
  const samples = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  const { duty, cycles } = periodic(source.samples, th, input.opamp.slew / source.frequency, samples);
  const { hi, lo } = extremes(samples);
  values['out.vpp'] = hi - lo;
  if (input.settings.isPeriodic) {
    values['freq'] = cycles * source.frequency;
    values['duty'] = duty;
  }
  if (!input.isTrial) {
    if (outputLevels(input).isLimited) {
      warnings.push({
        message: `the load on the output draws more than the op-amp's ${formatValue(currentLimit, 'A')} or so: it current-limits at ${formatValue(th.outLow, 'V')} … ${formatValue(th.outHigh, 'V')} and runs warm`,
      });
    }
    if (cycles === 0) {
      warnings.push({
        message: `the input swings ${formatValue(inLo, 'V')} … ${formatValue(inHi, 'V')} but the thresholds are ${formatValue(th.low, 'V')} and ${formatValue(th.high, 'V')}: the output never switches`,
      });
    }
    const transition = (th.outHigh - th.outLow) / input.opamp.slew;
    if (cycles > 0 && hi - lo < 0.98 * (th.outHigh - th.outLow)) {
      warnings.push({
        message: `each output edge takes ${formatValue(transition, 's')} at the op-amp's slew rate, longer than the signal leaves it: the output never reaches its levels, and its unfinished triangle can settle off centre either way (which one depends on how it started), so duty is no reliable check: use a faster op-amp`,
      });
    }
  }
  return { outputs: { out: { frequency: source.frequency, samples } }, values, warnings };
}

function checks(settings: ComparatorSettings): readonly CheckSpec[] {
  const list: CheckSpec[] = [
    {
      key: 'vth.high',
      quantity: 'upper threshold (output falls)',
      unit: 'V',
      instrument: 'meter',
      how: 'DC input from a bench supply: raise it slowly until the output falls; read the input with a meter',
    },
    {
      key: 'vth.low',
      quantity: 'lower threshold (output rises)',
      unit: 'V',
      instrument: 'meter',
      how: 'then lower the input slowly until the output rises again; read the input',
    },
    {
      key: 'hysteresis',
      quantity: 'hysteresis (upper − lower threshold)',
      unit: 'V',
      instrument: 'meter',
      how: 'the difference of the two threshold readings',
    },
    {
      key: 'out.vpp',
      quantity: 'output peak-to-peak',
      unit: 'V',
      output: 'out',
      instrument: 'scope',
      how: 'scope at the comparator output with the chain signal applied, read peak-to-peak',
      captureFigure: 'vpp',
    },
  ];
  if (settings.isPeriodic) {
    list.push(
      {
        key: 'freq',
        quantity: 'output frequency',
        unit: 'Hz',
        output: 'out',
        instrument: 'counter',
        how: 'counter or scope frequency readout at the comparator output',
        captureFigure: 'frequency',
      },
      {
        key: 'duty',
        quantity: 'output duty (fraction high)',
        unit: '1',
        output: 'out',
        instrument: 'scope',
        how: 'scope duty readout at the comparator output (positive duty)',
        captureFigure: 'duty',
      },
    );
  }
  return list;
}

const faults = (): readonly PartFaults[] => [
  { role: 'R1', modes: ['open', 'short'], description: 'resistor from the reference to the (+) input' },
  { role: 'R2', modes: ['open', 'short'], description: 'feedback resistor from the output to the (+) input' },
];

export const comparatorKind: StageKind<ComparatorSettings> = {
  kind: 'comparator',
  summary: 'op-amp comparator with hysteresis: input at (−), thresholds (Vref·R2 + Vout·R1)/(R1 + R2), output square at the swing',
  roles: [
    { role: 'R1', unit: 'Ω', description: 'resistor from the reference to the (+) input' },
    { role: 'R2', unit: 'Ω', description: 'feedback resistor from the output to the (+) input' },
    { role: 'vref', unit: 'V', description: 'reference voltage', optional: true },
  ],
  outputs: ['out'],
  needsInput: true,
  traits: { usesOpamp: true },
  parse(raw, file) {
    const r = reader(raw, file);
    const p = nested(r, 'parts', true);
    onlyKeys(p, ['R1', 'R2']);
    const parts: Record<string, PartValue> = {
      R1: partAt(p, 'R1', 'Ω', true, { positive: true, plausible: ohmRange, example: '"10k 1%"' }),
      R2: partAt(p, 'R2', 'Ω', true, { positive: true, plausible: ohmRange, example: '"100k 1%"' }),
      vref: partAt(r, 'vref', 'V', false, { plausible: [-50, 50], example: '"2.5 V 1%"' }) ?? { nominal: 0, tol: 0, unit: 'V', text: '0 V (default)' },
    };
    return { parts, settings: { isPeriodic: booleanAt(r, 'periodic', true) } };
  },
  checks,
  evaluate,
  faults,
  faultHints: {
    'vth.high': [
      'R1 and R2 swapped: the hysteresis becomes most of the output swing',
      'the reference off: measure it at R1',
      'the output not reaching its rail: a different op-amp, or a rail low',
    ],
    'vth.low': ['as the upper threshold: reference, R1/R2 ratio, output levels'],
    hysteresis: ['none at all: R2 open or not fitted (the output chatters on a slow or noisy input)', 'as wide as the output swing: R1 open, or R2 shorted'],
    'out.vpp': ['small or triangular: the op-amp too slow for the signal (slew rate)', 'no swing: the input never crosses both thresholds (amplitude too low)'],
    freq: ['zero: the input amplitude is below the thresholds', 'double: chatter from missing hysteresis on a noisy input'],
    duty: ['off centre: the reference or the threshold resistors, or an offset on the input'],
  },
};
