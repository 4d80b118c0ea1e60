import type { EvalOutput, Supplies, Waveform } from '../circuit/types.js';
import type { Unit } from '../units/unit.js';
import { type PlanCheck, planChecks } from './checks.js';
import type { Plan, PlanStage } from './types.js';

/** A toleranced value of the chain: a rail (`rails.+12V`) or a stage's part (`osc.Ct`). */
export interface ChainVariable {
  readonly name: string;
  /** Stage id, or `rails`. */
  readonly stage: string;
  /** Role within the stage, or the rail id. */
  readonly role: string;
  readonly nominal: number;
  /** Fraction; 0 for exact values (they are never varied). */
  readonly tol: number;
  readonly unit: Unit;
  readonly text: string;
}

/** One evaluation with every output kept, for the nominal case and for explanations. */
export interface ChainDetail {
  readonly values: Readonly<Record<string, number>>;
  readonly outputs: Readonly<Record<string, Waveform>>;
  readonly warnings: readonly { readonly stage: string; readonly message: string }[];
  /** Stages whose evaluation threw, with the message. */
  readonly failures: readonly { readonly stage: string; readonly message: string }[];
}

/**
 * A plan made ready for sampling. `evaluate` is the hot loop of the tolerance
 * engine: one call evaluates the whole chain for one sample `x` (one value per
 * variable, in `variables` order) and writes every check's value into `out`
 * (in `checks` order; NaN where a check has no computed value, such as the
 * unpowered rail checks, or where a stage could not be evaluated).
 */
export interface Chain {
  readonly variables: readonly ChainVariable[];
  readonly checks: readonly PlanCheck[];
  /** The nominal sample. */
  readonly nominal: Float64Array;
  /**
   * `stages` limits the evaluation to the first so many stages (chain order),
   * for callers that only need an upstream check; later checks are left NaN.
   * `reuse` takes the first so many stages from the nominal evaluation instead
   * of evaluating them: only valid when `x` differs from the nominal in no
   * variable of those stages and in no rail (one-part-at-a-time searches).
   * Stages see `isTrial: true` here (bench accuracy, no warnings); `detail`
   * evaluates exactly, for nominal values shown to the user.
   */
  evaluate(x: Float64Array, out: Float64Array, stages?: number, reuse?: number): void;
  /** Position of a stage in chain order, −1 for none (rails). */
  stageIndex(id: string): number;
  /** `stages` as in `evaluate`: only the first so many stages (chain order). */
  detail(x: Float64Array, stages?: number): ChainDetail;
}

const noValues: Record<string, number> = Object.freeze({}) as Record<string, number>;
const noOutputs: Record<string, Waveform> = Object.freeze({}) as Record<string, Waveform>;
const noList: never[] = Object.freeze([]) as unknown as never[];

/** Arguments of one stage evaluation, refilled in place on the hot path. */
interface HotArgs {
  parts: Record<string, number>;
  settings: unknown;
  opamp: PlanStage['opamp'];
  supplies: Supplies;
  rails: Record<string, number>;
  input?: Waveform;
  isTrial?: boolean;
  buffer?: ((slot: number, length: number) => Float64Array) | undefined;
}

/** A stage's own output arrays for trials, by slot (see EvalInput.buffer). */
function bufferPool(): (slot: number, length: number) => Float64Array {
  const arrays: Float64Array[] = [];
  return (slot, length) => {
    let a = arrays[slot];
    if (!a || a.length !== length) {
      a = new Float64Array(length);
      arrays[slot] = a;
    }
    return a;
  };
}

interface StagePlan {
  readonly stage: PlanStage;
  readonly roles: readonly string[];
  readonly varIndex: Int32Array;
  /** Check key → index in `out`. */
  readonly outIndex: readonly (readonly [string, number])[];
  /** Index of the input stage in the stage list, −1 when none. */
  readonly inputStage: number;
}

/**
 * Build the chain of a plan. Supplies for every op-amp stage are the plan's most
 * positive rail and its most negative rail (sampled with the rest); a plan with
 * no negative rail runs its op-amps between the positive rail and ground (0 V),
 * and one with no positive rail between ground and the negative rail.
 */
export function buildChain(plan: Plan): Chain {
  const variables: ChainVariable[] = [];
  for (const rail of plan.rails) {
    variables.push({ name: `rails.${rail.id}`, stage: 'rails', role: rail.id, nominal: rail.nominal, tol: rail.tol, unit: 'V', text: rail.text });
  }
  for (const stage of plan.stages) {
    for (const [role, part] of Object.entries(stage.parts)) {
      variables.push({ name: `${stage.id}.${role}`, stage: stage.id, role, nominal: part.nominal, tol: part.tol, unit: part.unit, text: part.text });
    }
  }
  const checks = planChecks(plan);
  const checkIndex = new Map(checks.map((c, i) => [c.check, i] as const));

  const railIds = plan.rails.map((r) => r.id);
  let posIdx = -1;
  let negIdx = -1;
  plan.rails.forEach((r, i) => {
    if (r.nominal > 0 && (posIdx < 0 || r.nominal > (plan.rails[posIdx]?.nominal ?? 0))) posIdx = i;
    if (r.nominal < 0 && (negIdx < 0 || r.nominal < (plan.rails[negIdx]?.nominal ?? 0))) negIdx = i;
  });
  const railDcOut = plan.rails.map((r) => checkIndex.get(`rails.${r.id}.dc`) ?? -1);

  const stageIds = plan.stages.map((s) => s.id);
  // Lookups by name through maps: searching the lists per stage made building a chain quadratic in its length.
  const stagePosition = new Map(stageIds.map((id, i) => [id, i] as const));
  const variablePosition = new Map(variables.map((v, i) => [v.name, i] as const));
  const checksByStage = new Map<string, (readonly [string, number])[]>();
  checks.forEach((c, i) => {
    const list = checksByStage.get(c.stage);
    if (list) list.push([c.key, i]);
    else checksByStage.set(c.stage, [[c.key, i]]);
  });
  const stagePlans: StagePlan[] = plan.stages.map((stage) => {
    const roles = Object.keys(stage.parts);
    const varIndex = Int32Array.from(roles, (role) => variablePosition.get(`${stage.id}.${role}`) ?? -1);
    const outIndex = checksByStage.get(stage.id) ?? [];
    return { stage, roles, varIndex, outIndex, inputStage: stage.input ? (stagePosition.get(stage.input.stage) ?? -1) : -1 };
  });

  let nominalResults: (EvalOutput | undefined)[] | undefined;
  // The hot path (keep = false) refills these objects in place instead of building new ones per
  // trial: stage kinds are pure functions of their input and keep no reference to it. Its
  // evaluations are marked as trials: nobody reads their warnings (`detail` is the exact path).
  const hotRails: Record<string, number> = Object.fromEntries(railIds.map((id) => [id, 0]));
  const hotSupplies = { pos: 0, neg: 0 };
  const hotArgs = stagePlans.map((sp) => {
    const parts: Record<string, number> = Object.fromEntries(sp.roles.map((r) => [r, 0]));
    const args: HotArgs = { parts, settings: sp.stage.settings, opamp: sp.stage.opamp, supplies: hotSupplies, rails: hotRails, isTrial: true, buffer: undefined };
    return args;
  });
  const hotResults: (EvalOutput | undefined)[] = new Array(stagePlans.length);
  const hotBuffers = stagePlans.map(() => bufferPool());

  const run = (x: Float64Array, out: Float64Array | undefined, keep: boolean, upTo = stagePlans.length, reuse = 0, capture?: (EvalOutput | undefined)[]): ChainDetail => {
    const rails: Record<string, number> = keep ? {} : hotRails;
    for (let i = 0; i < railIds.length; i++) {
      const v = x[i] ?? Number.NaN;
      rails[railIds[i] ?? ''] = v;
      const o = railDcOut[i] ?? -1;
      if (out && o >= 0) out[o] = v;
    }
    const pos = posIdx >= 0 ? (x[posIdx] ?? 0) : 0;
    const neg = negIdx >= 0 ? (x[negIdx] ?? 0) : 0;
    let supplies: Supplies;
    if (keep) supplies = { pos, neg };
    else {
      hotSupplies.pos = pos;
      hotSupplies.neg = neg;
      supplies = hotSupplies;
    }
    const results: (EvalOutput | undefined)[] = capture ?? (keep ? new Array(stagePlans.length) : hotResults);
    // The hot path (keep = false) allocates only what the stages need.
    const values: Record<string, number> = keep ? {} : noValues;
    const outputs: Record<string, Waveform> = keep ? {} : noOutputs;
    const warnings: { stage: string; message: string }[] = keep ? [] : noList;
    const failures: { stage: string; message: string }[] = keep ? [] : noList;
    for (let s = 0; s < upTo; s++) {
      const sp = stagePlans[s] as StagePlan;
      let input: Waveform | undefined;
      if (sp.inputStage >= 0) input = results[sp.inputStage]?.outputs[sp.stage.input?.output ?? ''];
      let result: EvalOutput | undefined;
      if (s < reuse) result = nominalResults?.[s];
      else if (sp.inputStage < 0 || input) {
        try {
          const args: HotArgs = keep ? { parts: {}, settings: sp.stage.settings, opamp: sp.stage.opamp, supplies, rails } : (hotArgs[s] as HotArgs);
          const parts = args.parts;
          for (let r = 0; r < sp.roles.length; r++) parts[sp.roles[r] ?? ''] = x[sp.varIndex[r] ?? -1] ?? Number.NaN;
          if (!keep) {
            if (input) args.input = input;
            // The captured nominal results are read again later: they must not share the trials' arrays.
            args.buffer = capture ? undefined : hotBuffers[s];
          }
          result = sp.stage.module.evaluate(input && keep ? { ...args, input } : args);
        } catch (error) {
          if (keep) failures.push({ stage: sp.stage.id, message: error instanceof Error ? error.message : String(error) });
        }
      } else {
        if (keep) failures.push({ stage: sp.stage.id, message: `its input ${sp.stage.input?.stage}.${sp.stage.input?.output} has no signal` });
      }
      results[s] = result;
      if (out) for (const [key, i] of sp.outIndex) out[i] = result?.values[key] ?? Number.NaN;
      if (keep && result) {
        for (const [key, v] of Object.entries(result.values)) values[`${sp.stage.id}.${key}`] = v;
        for (const [name, w] of Object.entries(result.outputs)) outputs[`${sp.stage.id}.${name}`] = w;
        for (const w of result.warnings) warnings.push({ stage: sp.stage.id, message: w.message });
      }
    }
    return { values, outputs, warnings, failures };
  };

  const nominal = Float64Array.from(variables, (v) => v.nominal);
  return {
    variables,
    checks,
    nominal,
    evaluate(x, out, stages, reuse) {
      out.fill(Number.NaN);
      const upTo = stages === undefined ? stagePlans.length : Math.max(0, Math.min(stagePlans.length, stages));
      let from = 0;
      if (reuse !== undefined && reuse > 0) {
        if (!nominalResults) {
          nominalResults = new Array(stagePlans.length);
          run(nominal, undefined, false, stagePlans.length, 0, nominalResults);
        }
        from = Math.min(reuse, upTo);
      }
      run(x, out, false, upTo, from);
    },
    stageIndex(id) {
      return stagePosition.get(id) ?? -1;
    },
    detail(x, stages) {
      const d = run(x, undefined, true, stages === undefined ? stagePlans.length : Math.max(0, Math.min(stagePlans.length, stages)));
      const values: Record<string, number> = { ...d.values };
      railIds.forEach((id, i) => {
        values[`rails.${id}.dc`] = x[i] ?? Number.NaN;
      });
      return { ...d, values };
    },
  };
}
