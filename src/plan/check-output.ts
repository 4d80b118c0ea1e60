import type { Plan } from './types.js';

/**
 * The output a check is probed at, `<stage>.<output>`, as its stage kind
 * declares it (`osc.triangle` for `osc.triangle.vpp`, the square for
 * `osc.freq`), else the kind's first output; null for rail checks.
 */
export function outputOf(plan: Plan, check: { readonly stage: string; readonly check: string }): string | null {
  const stage = plan.stages.find((s) => s.id === check.stage);
  if (!stage) return null;
  const key = check.check.slice(stage.id.length + 1);
  let spec;
  try {
    spec = stage.module.checks(stage.settings).find((c) => c.key === key);
  } catch {
    spec = undefined;
  }
  const output = spec?.output ?? stage.module.outputs.find((o) => key.startsWith(`${o}.`)) ?? stage.module.outputs[0];
  return output ? `${stage.id}.${output}` : null;
}
