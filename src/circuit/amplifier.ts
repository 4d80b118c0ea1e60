import { formatValue } from '../units/format.js';
import { swing } from './opamp.js';
import { singlePole } from './single-pole.js';
import type { CheckSpec, EvalInput, EvalOutput, OpampModel, StageWarning } from './types.js';

/**
 * What the inverting and non-inverting stages share: an op-amp with a single-pole
 * open-loop response A(s) = aol / (1 + s·aol / (2π·GBW)) closed around a resistive
 * feedback network whose noise gain is NG (1 + Rf/Rin or 1 + Rf/Rg).
 *
 * - DC gain: ideal / (1 + NG/aol) (Sedra and Smith, finite open-loop gain); the
 *   `gain` check is this DC (low-frequency) value, signed: negative when inverting.
 * - −3 dB bandwidth: the closed-loop pole sits at GBW·(1/NG + 1/aol), i.e.
 *   GBW/NG for any aol ≫ NG (Sedra and Smith, frequency response of closed-loop amplifiers).
 * - Output waveform: the input through that response (per harmonic, see
 *   single-pole.ts), clipped at the swing limits (rail − headroom), then slew-
 *   limited at the op-amp's slew rate, as an output stage does.
 * - Full-power bandwidth SR/(2π·Vpeak) (op-amp datasheet definition, common
 *   practice) appears in the warning when the output would need to slew faster
 *   than the op-amp can.
 */
export interface AmplifierShape {
  /** Ideal gain: −Rf/Rin or 1 + Rf/Rg. */
  readonly ideal: number;
  /** Noise gain, 1 + Rf/Rin or 1 + Rf/Rg. */
  readonly noiseGain: number;
}

export function closedLoop(shape: AmplifierShape, opamp: OpampModel): { gain: number; bw: number } {
  return {
    gain: shape.ideal / (1 + shape.noiseGain / opamp.aol),
    bw: opamp.gbw * (1 / shape.noiseGain + 1 / opamp.aol),
  };
}

/** Limit every step of a periodic waveform to `maxStep` volts, in steady state. */
function slewLimit(target: Float64Array, maxStep: number): { out: Float64Array; limited: boolean } {
  const n = target.length;
  const out = new Float64Array(n);
  let y = target[0] as number;
  let limited = false;
  // Three periods: the first reaches the steady state, the last is kept.
  for (let pass = 0; pass < 3; pass++) {
    for (let i = 0; i < n; i++) {
      const want = target[i] as number;
      const d = want - y;
      if (d > maxStep) {
        y += maxStep;
        if (pass === 2) limited = true;
      } else if (d < -maxStep) {
        y -= maxStep;
        if (pass === 2) limited = true;
      } else y = want;
      if (pass === 2) out[i] = y;
    }
  }
  return { out, limited };
}

export function evaluateAmplifier(shape: AmplifierShape, input: EvalInput<unknown>, kind: string): EvalOutput {
  const source = input.input;
  if (!source) throw new Error(`${kind}: no input waveform; the plan must name an "input"`);
  const { gain, bw } = closedLoop(shape, input.opamp);
  const filtered = singlePole(source.samples, source.frequency, bw);
  const n = filtered.length;
  const { high, low } = swing(input.opamp, input.supplies);
  let wantHi = -Infinity;
  let wantLo = Infinity;
  let steepest = 0;
  // One pass: scale, extremes, and the largest step between neighbours (the last wraps to the first).
  let previous = n > 0 ? gain * (filtered[n - 1] as number) : 0;
  for (let i = 0; i < n; i++) {
    const y = gain * (filtered[i] as number);
    filtered[i] = y;
    if (y > wantHi) wantHi = y;
    if (y < wantLo) wantLo = y;
    const d = y > previous ? y - previous : previous - y;
    if (d > steepest) steepest = d;
    previous = y;
  }
  const clipped = wantHi > high || wantLo < low;
  if (clipped) for (let i = 0; i < n; i++) filtered[i] = Math.min(high, Math.max(low, filtered[i] as number));
  let out = filtered;
  let slewed = false;
  const warnings: StageWarning[] = [];
  if (source.frequency > 0) {
    const h = 1 / (source.frequency * n);
    const needed = steepest / h;
    // Clipping never steepens a step, so when no step of the unclipped output exceeds
    // the slew limit the slew-limited waveform is the same one: skip its three passes.
    if (needed > input.opamp.slew) {
      out = slewLimit(filtered, input.opamp.slew * h).out;
      slewed = true;
    }
    if (needed > input.opamp.slew && !input.isTrial) {
      const peak = Math.max(Math.abs(wantHi), Math.abs(wantLo));
      // Full-power bandwidth SR / (2π·Vpeak): the highest frequency a full sine of this peak survives.
      const fpbw = input.opamp.slew / (2 * Math.PI * peak);
      warnings.push({
        message: `the output needs ${formatValue(needed, 'V/s')} but the op-amp slews ${formatValue(input.opamp.slew, 'V/s')}: edges turn into ramps (full-power bandwidth at ${formatValue(peak, 'V')} peak is ${formatValue(fpbw, 'Hz')})`,
      });
    }
  }
  if (clipped && !input.isTrial) {
    warnings.push({
      message: `the output would swing ${formatValue(wantLo, 'V')} … ${formatValue(wantHi, 'V')} but the op-amp reaches only ${formatValue(low, 'V')} … ${formatValue(high, 'V')} on these rails (headroom ${formatValue(input.opamp.headroom, 'V')}): it clips`,
    });
  }
  // Clipping maps the extremes onto the limits; only a slewed waveform needs a new scan.
  let hi = clipped ? Math.min(high, Math.max(low, wantHi)) : wantHi;
  let lo = clipped ? Math.min(high, Math.max(low, wantLo)) : wantLo;
  if (slewed) {
    hi = -Infinity;
    lo = Infinity;
    for (let i = 0; i < n; i++) {
      const v = out[i] as number;
      if (v > hi) hi = v;
      if (v < lo) lo = v;
    }
  }
  return {
    outputs: { out: { frequency: source.frequency, samples: out } },
    values: { gain, bw, 'out.vpp': hi - lo },
    warnings,
  };
}

export const amplifierChecks: readonly CheckSpec[] = [
  { key: 'gain', quantity: 'gain', unit: 'V/V', output: 'out', instrument: 'scope', how: 'two channels, input and output, at a frequency well below the bandwidth: output over input peak-to-peak, negative when the output is inverted' },
  { key: 'bw', quantity: '−3 dB bandwidth', unit: 'Hz', output: 'out', instrument: 'scope', how: 'small sine in, raise the generator frequency until the output falls to 0.707 of its low-frequency level; read the generator' },
  { key: 'out.vpp', captureFigure: 'vpp', quantity: 'peak-to-peak', unit: 'V', output: 'out', instrument: 'scope', how: 'scope DC-coupled at the amplifier output with the chain signal applied, read peak-to-peak' },
];

/** Fault hints both amplifier kinds share. */
export const amplifierHints: Readonly<Record<string, readonly string[]>> = {
  bw: [
    'a slower op-amp fitted than the plan assumes (lower gain-bandwidth)',
    'a capacitor across the feedback resistor, or a wrong value there',
    'the probe or a long lead loading the output: use a 10× probe',
  ],
  'out.vpp': [
    'the input level is off: check the upstream stage first',
    'clipping: a flat top means the rails are low or the signal too big for this gain',
    'slewing: straight ramps on a sine mean the op-amp is too slow for this frequency and level',
    'a gain resistor a decade off (×10 slip)',
  ],
};
