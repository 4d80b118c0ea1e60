import type { ChainDetail } from '../plan/chain.js';
import type { Plan } from '../plan/types.js';
import { formatValue } from '../units/format.js';
import { vpp } from '../circuit/waveform.js';
import type { DesignWarning } from './types.js';

/**
 * Design warnings before any power is applied (DESIGN §4), beyond the stages'
 * own: rails above an op-amp's supply ceiling, a signal above an amplifier's
 * full-power bandwidth or its small-signal bandwidth, stages that could not be
 * evaluated, and a plan without an idle current limit. The stages' own nominal
 * warnings come first, in chain order.
 */
export function designWarnings(plan: Plan, nominal: ChainDetail): DesignWarning[] {
  const out: DesignWarning[] = nominal.warnings.map((w) => ({ stage: w.stage, message: w.message }));
  for (const f of nominal.failures) out.push({ stage: f.stage, message: `could not be evaluated at nominal values: ${f.message}` });

  if (plan.idleCurrentMax === undefined) {
    out.push({ stage: 'rails', message: 'no idleCurrent.max in the plan: set the limit you will put on the bench supply for first power' });
  }

  for (const rail of plan.rails) {
    if (rail.tol === 0) {
      out.push({
        stage: 'rails',
        message: `rail ${rail.id} has no tolerance, so its band is a single value no reading can meet: give the regulator's, e.g. "tol": "5%"`,
      });
    }
  }

  for (const stage of plan.stages) {
    // Stages built around the op-amp (the kind's `usesOpamp` trait): its supply ceiling applies.
    if (!stage.module.traits?.usesOpamp) continue;
    // The supply ceiling is per rail, |V+| and |V−| (common practice, no source: general-purpose parts stop at about ±15 V).
    for (const rail of plan.rails) {
      const top = Math.abs(rail.nominal) * (1 + rail.tol);
      if (Math.abs(rail.nominal) > stage.opamp.maxSupply) {
        out.push({
          stage: stage.id,
          message: `rail ${rail.id} (${formatValue(rail.nominal, 'V')}) is above the op-amp's supply ceiling of ±${formatValue(stage.opamp.maxSupply, 'V')}: the part may fail at power-up`,
        });
      } else if (top > stage.opamp.maxSupply) {
        out.push({
          stage: stage.id,
          message: `rail ${rail.id} can reach ${formatValue(top, 'V')} at the top of its tolerance, above the op-amp's supply ceiling of ±${formatValue(stage.opamp.maxSupply, 'V')}`,
        });
      }
    }
  }

  for (const stage of plan.stages) {
    // Linear amplifiers (the `isAmplifier` trait): the signal must stay inside the op-amp's bandwidths.
    if (!stage.module.traits?.isAmplifier || !stage.input) continue;
    const input = nominal.outputs[`${stage.input.stage}.${stage.input.output}`];
    const output = nominal.outputs[`${stage.id}.out`];
    if (!input || !output || !(input.frequency > 0)) continue;
    const peak = vpp(output) / 2;
    // Full-power bandwidth SR / (2π·Vpeak) (Sedra and Smith, slew rate and full-power bandwidth).
    const fpbw = stage.opamp.slew / (2 * Math.PI * peak);
    // The amplifier kinds warn about slewing themselves; say it once.
    const saidSlew = nominal.warnings.some((w) => w.stage === stage.id && /slew/i.test(w.message));
    if (peak > 0 && input.frequency > fpbw && !saidSlew) {
      out.push({
        stage: stage.id,
        message: `the signal (${formatValue(input.frequency, 'Hz')}, ${formatValue(peak, 'V')} peak out) is above the full-power bandwidth ${formatValue(fpbw, 'Hz')} of the op-amp: the output will slew and distort`,
      });
    }
    const bw = nominal.values[`${stage.id}.bw`];
    if (bw !== undefined && Number.isFinite(bw) && input.frequency > bw / 3) {
      out.push({
        stage: stage.id,
        message: `the signal (${formatValue(input.frequency, 'Hz')}) is within a factor 3 of the closed-loop bandwidth ${formatValue(bw, 'Hz')}: gain and phase will droop`,
      });
    }
  }
  return dedupe(out);
}

function dedupe(warnings: DesignWarning[]): DesignWarning[] {
  const seen = new Set<string>();
  return warnings.filter((w) => {
    const key = `${w.stage}\u0000${w.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
