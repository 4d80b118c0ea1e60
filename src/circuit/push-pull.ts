import { StageParseError } from './errors.js';
import { formatValue } from '../units/format.js';
import { choiceAt, nested, ohmRange, onlyKeys, partAt, reader } from './stage-parse.js';
import type { CheckSpec, EvalInput, EvalOutput, PartValue, StageKind, StageWarning } from './types.js';

/**
 * A complementary emitter follower (NPN on top, PNP below, emitters joined at the
 * output), as in Horowitz and Hill, push-pull followers and crossover distortion:
 *
 * - `bias: "none"`: both bases driven by the input. The NPN conducts once the input
 *   is a Vbe above the output, the PNP once it is a Vbe below, so the output is
 *   input − Vbe, input + Vbe, or 0 in between: a dead band of 2·Vbe (crossover).
 * - `bias: "diodes"`: two diodes between the bases, fed by the bias network, hold
 *   each base a diode drop away from the input; the drops cancel and the output
 *   follows the input. They cancel only as well as the bias diode's drop `vd`
 *   matches Vbe: a diode that drops less than the transistor leaves a dead band
 *   of 2·(Vbe − vd); one that drops more makes a standing (class-AB) current
 *   instead. Without a plan value, vd is Vbe ± 8 % (a diode and a base-emitter
 *   junction at similar currents match within about ±50 mV; common practice,
 *   no source), so the dead band target is 0 … about 0.1 V, not an impossible 0.
 *
 * The output cannot go nearer a rail than a Vbe (the base can be driven at most to
 * the rail; common practice, no source). Vbe defaults to 0.65 V (a silicon junction
 * drops about 0.6–0.7 V; common practice, no source) and hfe to 100.
 */
export interface PushPullSettings {
  readonly bias: 'none' | 'diodes';
  readonly hasLoad: boolean;
}

export const defaultVbe = 0.65;
/** Spread of a bias diode's drop against Vbe when the plan gives none (common practice, no source). */
const defaultMatch = 0.08;
export const defaultHfe = 100;
/** A TO-92 transistor gets too hot to touch near half a watt (common practice, no source). */
const hotWatts = 0.5;

function evaluate(input: EvalInput<PushPullSettings>): EvalOutput {
  const source = input.input;
  if (!source) throw new Error('push-pull: no input waveform; the plan must name an "input"');
  const vbe = input.parts['vbe'] ?? defaultVbe;
  const hfe = input.parts['hfe'] ?? defaultHfe;
  const load = input.settings.hasLoad ? (input.parts['Rload'] ?? Number.NaN) : Number.POSITIVE_INFINITY;
  const crossover = input.settings.bias === 'none';
  // The part of Vbe the bias diode does not cancel (0 when it drops as much or more).
  const dead = crossover ? vbe : Math.max(0, vbe - (input.parts['vd'] ?? vbe));
  const high = input.supplies.pos - vbe;
  const low = input.supplies.neg + vbe;
  const samples = source.samples;
  const n = samples.length;
  const out = input.buffer ? input.buffer(0, n) : new Float64Array(n);
  let hi = -Infinity;
  let lo = Infinity;
  let clipped = false;
  for (let i = 0; i < n; i++) {
    const x = samples[i] as number;
    let y = x > dead ? x - dead : x < -dead ? x + dead : 0;
    if (y > high || y < low) {
      clipped = true;
      y = Math.min(high, Math.max(low, y));
    }
    out[i] = y;
    if (y > hi) hi = y;
    if (y < lo) lo = y;
  }
  // Collector dissipation (Vce · Ie) of whichever transistor conducts, for the warning only
  // (a Monte Carlo trial reads no warnings).
  let heatTop = 0;
  let heatBottom = 0;
  if (!input.isTrial && input.settings.hasLoad) {
    const pos = input.supplies.pos;
    const neg = input.supplies.neg;
    for (let i = 0; i < n; i++) {
      const y = out[i] as number;
      if (y > 0) heatTop += (pos - y) * y;
      else heatBottom += (y - neg) * -y;
    }
    heatTop /= load;
    heatBottom /= load;
  }
  const ipeak = Math.max(Math.abs(hi), Math.abs(lo)) / load;
  const values: Record<string, number> = { 'out.vpp': hi - lo, deadband: 2 * dead };
  if (input.settings.hasLoad) {
    values['out.ipeak'] = ipeak;
    values['base.ipeak'] = ipeak / hfe;
  }
  const warnings: StageWarning[] = [];
  if (input.isTrial) return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
  if (crossover) {
    warnings.push({ message: `no bias: a dead band of ±${formatValue(vbe, 'V')} around zero (crossover distortion); the output loses a Vbe on each peak` });
  }
  if (clipped) {
    warnings.push({ message: `the output would pass ${formatValue(low, 'V')} … ${formatValue(high, 'V')}, a Vbe inside the rails: it clips` });
  }
  const watts = Math.max(heatTop, heatBottom) / n;
  if (input.settings.hasLoad && watts > hotWatts) {
    warnings.push({ message: `each output transistor dissipates about ${formatValue(watts, 'W')}: too hot for a small package without a heatsink; do not touch the transistors while the signal runs` });
  }
  return { outputs: { out: { frequency: source.frequency, samples: out } }, values, warnings };
}

function checks(settings: PushPullSettings): readonly CheckSpec[] {
  const list: CheckSpec[] = [
    { key: 'out.vpp', captureFigure: 'vpp', quantity: 'peak-to-peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope DC-coupled at the output across the load, read peak-to-peak' },
    { key: 'deadband', quantity: 'crossover dead band (total width)', unit: 'V', output: 'out', instrument: 'scope', how: 'scope in X-Y mode, input on X and output on Y: read the width of the flat step around zero', floor: 0 },
  ];
  if (settings.hasLoad) {
    list.push(
      { key: 'out.ipeak', quantity: 'peak load current', unit: 'A', output: 'out', instrument: 'scope', how: 'scope across the load resistor: peak voltage over its value' },
      { key: 'base.ipeak', quantity: 'peak base drive current', unit: 'A', instrument: 'scope', how: 'scope across a series base resistor if fitted, or from the driver\'s output; peak voltage over the resistor' },
    );
  }
  return list;
}

export const pushPullKind: StageKind<PushPullSettings> = {
  kind: 'push-pull',
  summary: 'complementary emitter-follower output: dead band 2·Vbe without bias, ≈ unity with diode bias; load and base currents',
  traits: { usesOpamp: false, isAmplifier: false, isHandWritten: false },
  roles: [
    { role: 'Rload', unit: 'Ω', description: 'load from the output to ground', optional: true },
    { role: 'vbe', unit: 'V', description: 'base-emitter drop of the output transistors', optional: true },
    { role: 'hfe', unit: 'V/V', description: 'current gain of the output transistors', optional: true },
    { role: 'vd', unit: 'V', description: 'drop of each bias diode (diode bias only; default Vbe ± 8 %)', optional: true },
  ],
  outputs: ['out'],
  needsInput: true,
  parse(raw, file) {
    const r = reader(raw, file);
    const p = nested(r, 'parts');
    onlyKeys(p, ['Rload']);
    const parts: Record<string, PartValue> = {};
    const load = partAt(p, 'Rload', 'Ω', false, { positive: true, plausible: ohmRange, example: '"1k 5%"' });
    if (load) parts['Rload'] = load;
    const vbe = partAt(r, 'vbe', 'V', false, { positive: true, example: '"0.65 V 10%"' });
    if (vbe) parts['vbe'] = vbe;
    const hfe = partAt(r, 'hfe', 'V/V', false, { positive: true, example: '100' });
    if (hfe) parts['hfe'] = hfe;
    const bias = choiceAt(r, 'bias', ['none', 'diodes'] as const);
    const vd = partAt(r, 'vd', 'V', false, { positive: true, example: '"0.65 V 8%"' });
    if (vd && bias !== 'diodes') throw new StageParseError(file, `${raw.path}.vd`, 'a bias diode drop only applies with "bias": "diodes"; remove it or set the bias');
    if (bias === 'diodes') {
      const v = vbe?.nominal ?? defaultVbe;
      parts['vd'] = vd ?? { nominal: v, tol: defaultMatch, unit: 'V', text: `${v} V ${defaultMatch * 100}% (default: matched to Vbe)` };
    }
    return { parts, settings: { bias, hasLoad: load !== undefined } };
  },
  checks,
  evaluate,
  faultHints: {
    'out.vpp': [
      'the drive level is off: check the upstream stage first',
      'one transistor open or not fitted: only one half of the wave appears',
      'a bias diode shorted: crossover appears although the plan has diode bias',
      'caution: output transistors get hot under signal; let them cool before touching or reworking',
    ],
    deadband: [
      'a bias diode open or its bias resistor wrong: the step at zero returns',
      'the bias diodes fitted backwards',
      'caution: a bias set too high makes the transistors run hot (thermal runaway); power off if they heat with no signal',
    ],
    'out.ipeak': ['the load is not the value the plan assumes', 'the output is clipping: check the rails'],
    'base.ipeak': ['a lower-gain transistor fitted (hfe below the plan\'s)', 'the driver cannot supply the base current: its output sags at the peaks'],
  },
};
