import { formatValue } from '../units/format.js';
import { swing } from './opamp.js';
import type { OpampModel, StageWarning, Supplies } from './types.js';

/** What the op-amp's output limits did to one period of a wanted output. */
export interface LimitedOutput {
  /** Highest and lowest sample after clipping and slewing, V. */
  readonly hi: number;
  readonly lo: number;
  readonly warnings: StageWarning[];
}

/**
 * Hold a wanted op-amp output (one period, in place) to what the op-amp can
 * give: clipped at rail − headroom on each side, then every step limited to
 * the slew rate, in steady state (three passes over the period, the last kept),
 * as the gain stages do (amplifier.ts). Warnings name the figures, and the
 * full-power bandwidth SR/(2π·Vpeak) (op-amp datasheet definition, common
 * practice) when slewing.
 */
export function limitOutput(out: Float64Array, frequency: number, opamp: OpampModel, supplies: Supplies, isTrial: boolean): LimitedOutput {
  const n = out.length;
  const { high, low } = swing(opamp, supplies);
  let wantHi = -Infinity;
  let wantLo = Infinity;
  for (let i = 0; i < n; i++) {
    const v = out[i] as number;
    if (v > wantHi) wantHi = v;
    if (v < wantLo) wantLo = v;
  }
  const warnings: StageWarning[] = [];
  const clipped = wantHi > high || wantLo < low;
  if (clipped) {
    for (let i = 0; i < n; i++) out[i] = Math.min(high, Math.max(low, out[i] as number));
    if (!isTrial) {
      warnings.push({
        message: `the output would swing ${formatValue(wantLo, 'V')} … ${formatValue(wantHi, 'V')} but the op-amp reaches only ${formatValue(low, 'V')} … ${formatValue(high, 'V')} on these rails (headroom ${formatValue(opamp.headroom, 'V')}): it clips`,
      });
    }
  }
  if (frequency > 0 && n > 1) {
    const h = 1 / (frequency * n);
    let steepest = 0;
    let previous = out[n - 1] as number;
    for (let i = 0; i < n; i++) {
      const v = out[i] as number;
      steepest = Math.max(steepest, Math.abs(v - previous));
      previous = v;
    }
    const needed = steepest / h;
    if (needed > opamp.slew) {
      const step = opamp.slew * h;
      let y = out[0] as number;
      const wanted = Float64Array.from(out);
      for (let pass = 0; pass < 3; pass++) {
        for (let i = 0; i < n; i++) {
          const d = (wanted[i] as number) - y;
          y = d > step ? y + step : d < -step ? y - step : (wanted[i] as number);
          if (pass === 2) out[i] = y;
        }
      }
      if (!isTrial) {
        const peak = Math.max(Math.abs(wantHi), Math.abs(wantLo));
        const fpbw = opamp.slew / (2 * Math.PI * peak);
        warnings.push({
          message: `the output needs ${formatValue(needed, 'V/s')} but the op-amp slews ${formatValue(opamp.slew, 'V/s')}: edges turn into ramps (full-power bandwidth at ${formatValue(peak, 'V')} peak is ${formatValue(fpbw, 'Hz')})`,
        });
      }
    }
  }
  let hi = -Infinity;
  let lo = Infinity;
  for (let i = 0; i < n; i++) {
    const v = out[i] as number;
    if (v > hi) hi = v;
    if (v < lo) lo = v;
  }
  return { hi, lo, warnings };
}
