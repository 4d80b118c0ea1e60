import type { Waveform } from '../circuit/types.js';
import { vpp } from '../circuit/waveform.js';
import { buildChain } from '../plan/chain.js';
import { outputOf } from '../plan/check-output.js';
import type { Plan } from '../plan/types.js';
import type { Target } from './types.js';

/** The band a trace may lie in, sample by sample (volts). */
export interface TraceBand {
  readonly min: Float64Array;
  readonly max: Float64Array;
}

/** What the trace panel draws for a check: two periods of the ideal waveform and its amplitude band. */
export interface ExpectedTrace {
  /** `<stage>.<output>` the check is probed at. */
  readonly output: string;
  readonly samples: Float64Array;
  readonly band?: TraceBand;
  readonly frequency: number;
  readonly vpp: number;
}

/** Every stage output of the chain at nominal part values, `<stage>.<output>` → waveform. */
export function nominalOutputs(plan: Plan): Readonly<Record<string, Waveform>> {
  try {
    const chain = buildChain(plan);
    return chain.detail(chain.nominal).outputs;
  } catch {
    // A chain that cannot be evaluated has nothing to draw; the plan screen reports why.
    return {};
  }
}

/**
 * The expected trace at a check's test point: two periods of the nominal
 * waveform and, when the output has a peak-to-peak target, the band that
 * target allows, drawn as the waveform scaled to the band's two ends about its mean.
 */
export function expectedTrace(plan: Plan, targets: readonly Target[], target: Target, outputs: Readonly<Record<string, Waveform>>): ExpectedTrace | null {
  const output = outputOf(plan, target);
  const wave = output ? outputs[output] : undefined;
  if (!output || !wave || !(wave.frequency > 0) || wave.samples.length < 2) return null;
  const n = wave.samples.length;
  const samples = new Float64Array(2 * n);
  samples.set(wave.samples, 0);
  samples.set(wave.samples, n);
  const amplitude = vpp(wave);
  const vppTarget = targets.find((t) => t.check === `${output}.vpp`);
  if (!vppTarget || !(vppTarget.nominal > 0) || !Number.isFinite(vppTarget.worst.min) || !Number.isFinite(vppTarget.worst.max)) {
    return { output, samples, frequency: wave.frequency, vpp: amplitude };
  }
  let mean = 0;
  for (const v of samples) mean += v;
  mean /= samples.length;
  const scaled = (k: number) => samples.map((v) => mean + (v - mean) * k);
  const lo = scaled(vppTarget.worst.min / vppTarget.nominal);
  const hi = scaled(vppTarget.worst.max / vppTarget.nominal);
  // Where the waveform dips below its mean, the larger amplitude is the lower limit.
  const min = lo.map((v, i) => Math.min(v, hi[i] ?? v));
  const max = lo.map((v, i) => Math.max(v, hi[i] ?? v));
  return { output, samples, band: { min, max }, frequency: wave.frequency, vpp: amplitude };
}
