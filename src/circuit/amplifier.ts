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
  /** Feedback resistor, Ω: the op-amp's bias current into the inverting input flows through it. */
  readonly rf?: number;
}

/**
 * The output's DC shift from the op-amp's own input errors: vos × noise gain
 * (the offset sits in series with the non-inverting input, so it sees the noise
 * gain in either configuration) plus ib × Rf (the inverting input's bias current
 * flows from the output through Rf, the non-inverting input driven from a low
 * impedance). Sedra and Smith, DC imperfections of op-amps.
 */
export function outputOffset(shape: AmplifierShape, opamp: OpampModel): number {
  return (opamp.vos ?? 0) * shape.noiseGain + (opamp.ib ?? 0) * (shape.rf ?? 0);
}

export function closedLoop(shape: AmplifierShape, opamp: OpampModel): { gain: number; bw: number } {
  return {
    gain: shape.ideal / (1 + shape.noiseGain / opamp.aol),
    bw: opamp.gbw * (1 / shape.noiseGain + 1 / opamp.aol),
  };
}

/**
 * The slewing output, integrated: an op-amp whose input pair saturates (the
 * tanh law of a long-tailed pair) with one pole at GBW moves its output at
 * dy/dt = SR·tanh((ideal − y)/(SR·τ)), τ = 1/(2π·bw), since its differential
 * input is (ideal − y)/NG and full slew needs an overdrive of SR/(2π·GBW)
 * (Sedra and Smith, slew rate and the input stage). Small errors give the
 * closed-loop single pole, large ones the slew rate, and in between the output
 * stops slewing before it reaches the ideal peak, which a hard slew clamp
 * (or SR/(4f)) overstates by several per cent. `ideal` is the gain times the
 * input, linear between samples; clipping holds y at the swing limits (no
 * wind-up, as an output stage saturates). Trapezoidal steps (A-stable) with
 * Newton's method on each, fine enough to resolve τ, until the period repeats.
 */
function slewFollow(ideal: Float64Array, frequency: number, slew: number, bw: number, low: number, high: number): Float64Array {
  const n = ideal.length;
  const out = new Float64Array(n);
  const tau = 1 / (2 * Math.PI * bw);
  const v = slew * tau;
  const h = 1 / (frequency * n);
  const m = Math.min(64, Math.max(1, Math.ceil((2 * h) / tau)));
  const hs = h / m;
  const rate = (u: number, y: number): number => slew * Math.tanh((u - y) / v);
  let y = ideal[0] as number;
  for (let pass = 0; pass < 12; pass++) {
    const start = y;
    for (let i = 0; i < n; i++) {
      out[i] = y;
      const u0 = ideal[i] as number;
      const u1 = ideal[i + 1 < n ? i + 1 : 0] as number;
      for (let k = 0; k < m; k++) {
        const a = u0 + ((u1 - u0) * k) / m;
        const b = u0 + ((u1 - u0) * (k + 1)) / m;
        const f0 = rate(a, y);
        // y1 = y + hs/2·(f0 + rate(b, y1)), by Newton from the explicit guess.
        let y1 = y + hs * f0;
        for (let it = 0; it < 20; it++) {
          const t = Math.tanh((b - y1) / v);
          const g = y1 - y - 0.5 * hs * (f0 + slew * t);
          const d = g / (1 + (0.5 * hs * slew * (1 - t * t)) / v);
          y1 -= d;
          if (Math.abs(d) < 1e-9) break;
        }
        y = Math.min(high, Math.max(low, y1));
      }
    }
    if (pass >= 2 && Math.abs(y - start) < 1e-7) break;
  }
  return out;
}

export function evaluateAmplifier(shape: AmplifierShape, input: EvalInput<unknown>, kind: string): EvalOutput {
  const source = input.input;
  if (!source) throw new Error(`${kind}: no input waveform; the plan must name an "input"`);
  const { gain, bw } = closedLoop(shape, input.opamp);
  const filtered = singlePole(source.samples, source.frequency, bw, input.buffer?.(0, source.samples.length));
  const n = filtered.length;
  const offset = outputOffset(shape, input.opamp);
  const { high, low } = swing(input.opamp, input.supplies);
  let wantHi = -Infinity;
  let wantLo = Infinity;
  let steepest = 0;
  // One pass: scale, extremes, and the largest step between neighbours (the last wraps to the first).
  let previous = n > 0 ? gain * (filtered[n - 1] as number) : 0;
  for (let i = 0; i < n; i++) {
    const y = gain * (filtered[i] as number) + offset;
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
      const ideal = new Float64Array(n);
      for (let i = 0; i < n; i++) ideal[i] = gain * (source.samples[i] as number);
      out = slewFollow(ideal, source.frequency, input.opamp.slew, bw, low, high);
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
  // What a DC meter reads: the mean over a whole period, after clipping and slewing
  // (a stage stuck at a rail reads that rail's swing limit).
  let sum = 0;
  for (let i = 0; i < n; i++) sum += out[i] as number;
  return {
    outputs: { out: { frequency: source.frequency, samples: out } },
    values: { gain, bw, 'out.vpp': hi - lo, 'out.dc': n > 0 ? sum / n : Number.NaN },
    warnings,
  };
}

export const amplifierChecks: readonly CheckSpec[] = [
  {
    key: 'gain',
    quantity: 'gain',
    unit: 'V/V',
    output: 'out',
    instrument: 'scope',
    how: 'two channels, input and output, at a frequency well below the bandwidth: output over input peak-to-peak, negative when the output is inverted',
  },
  {
    key: 'bw',
    quantity: '−3 dB bandwidth',
    unit: 'Hz',
    output: 'out',
    instrument: 'scope',
    how: 'small sine in, raise the generator frequency until the output falls to 0.707 of its low-frequency level; read the generator',
  },
  {
    key: 'out.vpp',
    captureFigure: 'vpp',
    quantity: 'peak-to-peak',
    unit: 'V',
    output: 'out',
    instrument: 'scope',
    how: 'scope DC-coupled at the amplifier output with the chain signal applied, read peak-to-peak',
  },
  {
    key: 'out.dc',
    quantity: 'DC level (average)',
    unit: 'V',
    output: 'out',
    instrument: 'meter',
    captureFigure: 'mean',
    how: "meter on DC volts from the amplifier output to ground, signal running (it reads the average); a reading within a volt or two of a rail means the stage is stuck there — the commonest fault on a new board: check the feedback resistor, the input pins and the op-amp's supply pins before anything downstream",
  },
];

/** Fault hints both amplifier kinds share. */
export const amplifierHints: Readonly<Record<string, readonly string[]>> = {
  'out.dc': [
    'stuck at a rail: the feedback loop is open (Rf missing or a dry joint) or an input pin is lifted',
    'stuck at a rail: the op-amp fitted the wrong way round or not powered (check both supply pins first)',
    "a steady offset of tens of millivolts: the op-amp's input offset times the noise gain, or bias current through a large Rf",
    "the upstream stage's own DC level passed on and amplified: measure the input's DC level too",
  ],
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
