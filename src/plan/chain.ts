import type { Complex, EvalOutput, OpampModel, StageFault, Supplies, Waveform } from '../circuit/types.js';
import { type OpampSpreadKey, type Spread, opampSpreadKeys } from './active-spread.js';
import type { Unit } from '../units/unit.js';
import { type PlanCheck, planChecks } from './checks.js';
import { externalLoadPrefix } from './stages.js';
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
  /**
   * Half-width of the variable's box in its unit: the value lies in nominal ± spread.
   * Set on every variable the chain builds; absent on hand-built ones, where it is
   * |nominal|·tol (see `spreadOf`). A variable centred on zero (an op-amp's offset
   * `opamp.vos`) has tol 0 and only a spread.
   */
  readonly spread?: number;
}

/** Half-width of a variable's box (nominal ± this), in its unit. */
export function spreadOf(v: ChainVariable): number {
  return v.spread ?? Math.abs(v.nominal) * v.tol;
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
   * evaluates exactly, for nominal values shown to the user. `fault` applies
   * one non-value fault to its stage for this evaluation only (how it changes
   * the load the stage puts on its input is not modelled).
   */
  evaluate(x: Float64Array, out: Float64Array, stages?: number, reuse?: number, fault?: ChainFault): void;
  /** Position of a stage in chain order, −1 for none (rails). */
  stageIndex(id: string): number;
  /**
   * Stages after `id` whose parts change its evaluation through loading (they
   * load its output, or the output of a stage it takes its input from through a
   * passive path): a search over the variables that move a check of `id` needs theirs too.
   */
  loaders(id: string): string[];
  /** `stages` as in `evaluate`: only the first so many stages (chain order); `fault` as in `evaluate`. */
  detail(x: Float64Array, stages?: number, fault?: ChainFault): ChainDetail;
}

/** A single non-value fault on one stage's part, for one evaluation (diagnosis, DESIGN §5a). */
export interface ChainFault extends StageFault {
  readonly stage: string;
}

const opampUnits: Readonly<Record<OpampSpreadKey, Unit>> = { gbw: 'Hz', slew: 'V/s', headroom: 'V', vos: 'V', ib: 'A' };

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
  load?: ((output: string, f: number) => Complex | undefined) | undefined;
  temperature?: number | undefined;
  fault?: StageFault | undefined;
}

/**
 * What a stage kind's `inputImpedance` reads, for the current sample: `run` sets
 * `parts` and `rails` as plain fields before any stage evaluates (getters closing
 * over each stage made every object its own shape, and the impedance calls down a
 * loaded chain slow property reads; measured on bench/plan-size.bench.ts).
 */
interface ImpedanceArgs {
  parts: Record<string, number>;
  readonly settings: unknown;
  readonly opamp: PlanStage['opamp'];
  load: ((output: string, f: number) => Complex | undefined) | undefined;
  /** The current sample's rails (a rail-tied stage sets its impedances from its operating point). */
  rails: Record<string, number>;
}

/** Op-amp keys a chain may vary, and where a stage's sampled value sits in `x` (−1: the plan's fixed value). */
const opampKeys = opampSpreadKeys;
type MutableOpamp = { -readonly [K in keyof OpampModel]: OpampModel[K] };

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
  /** Variable index of each of `opampKeys` for this stage's op-amp, −1 when fixed; null when none varies. */
  readonly opampIndex: Int32Array | null;
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
      variables.push({
        name: `${stage.id}.${role}`,
        stage: stage.id,
        role,
        nominal: part.nominal,
        tol: part.tol,
        unit: part.unit,
        text: part.text,
        spread: Math.abs(part.nominal) * part.tol,
      });
    }
  }
  // Active parts (issue 11): the op-amp's toleranced keys, once for the plan's part (shared by every
  // op-amp stage that does not name its own) and once per stage with its own; then the temperature.
  const opampStages = plan.stages.filter((s) => s.module.traits?.usesOpamp === true);
  const opampVariable = (prefix: string, stageId: string, key: OpampSpreadKey, model: OpampModel, spread: Spread): void => {
    const nominal = model[key] ?? 0;
    const name = `${prefix}opamp.${key}`;
    if (variables.some((v) => v.name === name)) return;
    variables.push({
      name,
      stage: stageId,
      role: `opamp.${key}`,
      nominal,
      tol: nominal === 0 ? 0 : spread.half / Math.abs(nominal),
      unit: opampUnits[key],
      text: spread.text,
      spread: spread.half,
    });
  };
  for (const s of opampStages) {
    const own = s.hasOwnOpamp === true;
    for (const key of opampKeys) {
      const spread = s.opampSpread?.[key];
      if (spread && spread.half > 0) opampVariable(own ? `${s.id}.` : '', own ? s.id : 'opamp', key, s.opamp, spread);
    }
  }
  if (plan.temperature) {
    const t = plan.temperature;
    variables.push({
      name: 'temperature',
      stage: 'temperature',
      role: 'temperature',
      nominal: t.nominal,
      tol: (t.max - t.nominal) / t.nominal,
      unit: 'K',
      text: t.text,
      spread: t.max - t.nominal,
    });
  }
  const temperatureIndex = variables.findIndex((v) => v.name === 'temperature');
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
    const prefix = stage.hasOwnOpamp === true ? `${stage.id}.` : '';
    const opampIndex = Int32Array.from(opampKeys, (key) =>
      stage.module.traits?.usesOpamp === true ? (variablePosition.get(`${prefix}opamp.${key}`) ?? -1) : -1,
    );
    return {
      stage,
      roles,
      varIndex,
      outIndex,
      inputStage: stage.input ? (stagePosition.get(stage.input.stage) ?? -1) : -1,
      opampIndex: opampIndex.some((i) => i >= 0) ? opampIndex : null,
    };
  });

  // Loading (DESIGN §3: every stage's input loads the output it takes). For each
  // stage and output: the downstream stages that take it (when their kind has an
  // input impedance) and any external load the plan names. The load functions read
  // the parts of the current sample from `impedanceArgs[s].parts`, which `run` fills for every
  // stage before it evaluates any: an upstream output depends on downstream parts.
  const impedanceArgs: ImpedanceArgs[] = stagePlans.map((sp) => ({
    parts: {},
    rails: {},
    settings: sp.stage.settings,
    opamp: sp.stage.opamp,
    load: undefined,
  }));
  // Which sample the load functions' memory holds: `run` moves it on whenever it sets the parts and rails.
  const sample = { generation: 0 };
  const loadFns = stagePlans.map((sp, s) => loadFunction(sp.stage, s, stagePlans, impedanceArgs, sample));
  // A downstream passive stage's input depends on its own load: hand it its load function.
  impedanceArgs.forEach((a, i) => {
    a.load = loadFns[i];
  });
  // How far up the chain a change of stage s's parts reaches through loading: the
  // first stage whose evaluation it can change (s itself when nothing upstream feels it).
  const reach = stagePlans.map((_, s) => {
    let first = s;
    let cur = s;
    while (true) {
      const sp = stagePlans[cur] as StagePlan;
      // Only an upstream output with a source impedance feels its load (an op-amp output does not).
      if (sp.inputStage < 0 || !sp.stage.module.inputImpedance || !stagePlans[sp.inputStage]?.stage.module.outputImpedance) break;
      cur = sp.inputStage;
      first = Math.min(first, cur);
    }
    return first;
  });

  let nominalResults: (EvalOutput | undefined)[] | undefined;
  // The hot path (keep = false) refills these objects in place instead of building new ones per
  // trial: stage kinds are pure functions of their input and keep no reference to it. Its
  // evaluations are marked as trials: nobody reads their warnings (`detail` is the exact path).
  const hotRails: Record<string, number> = Object.fromEntries(railIds.map((id) => [id, 0]));
  const hotSupplies = { pos: 0, neg: 0 };
  const hotArgs = stagePlans.map((sp) => {
    const parts: Record<string, number> = Object.fromEntries(sp.roles.map((r) => [r, 0]));
    const opamp = sp.opampIndex ? { ...sp.stage.opamp } : sp.stage.opamp;
    const args: HotArgs = {
      parts,
      settings: sp.stage.settings,
      opamp,
      supplies: hotSupplies,
      rails: hotRails,
      isTrial: true,
      buffer: undefined,
      load: undefined,
    };
    return args;
  });
  const hotResults: (EvalOutput | undefined)[] = new Array(stagePlans.length);
  const hotBuffers = stagePlans.map(() => bufferPool());

  const run = (
    x: Float64Array,
    out: Float64Array | undefined,
    keep: boolean,
    upTo = stagePlans.length,
    reuse = 0,
    capture?: (EvalOutput | undefined)[],
    carry = 0,
    fault?: ChainFault,
  ): ChainDetail => {
    const rails: Record<string, number> = keep ? {} : hotRails;
    for (let i = 0; i < railIds.length; i++) {
      const v = x[i] ?? Number.NaN;
      rails[railIds[i] ?? ''] = v;
      const o = railDcOut[i] ?? -1;
      if (out && o >= 0) out[o] = v;
    }
    for (const a of impedanceArgs) a.rails = rails;
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
    // Every stage's parts first: the load functions of upstream stages read them.
    for (let s = 0; s < stagePlans.length; s++) {
      const sp = stagePlans[s] as StagePlan;
      const parts = keep ? {} : (hotArgs[s] as HotArgs).parts;
      for (let r = 0; r < sp.roles.length; r++) parts[sp.roles[r] ?? ''] = x[sp.varIndex[r] ?? -1] ?? Number.NaN;
      (impedanceArgs[s] as ImpedanceArgs).parts = parts;
    }
    sample.generation++;
    for (let s = 0; s < upTo; s++) {
      const sp = stagePlans[s] as StagePlan;
      let input: Waveform | undefined;
      if (sp.inputStage >= 0) input = results[sp.inputStage]?.outputs[sp.stage.input?.output ?? ''];
      let result: EvalOutput | undefined;
      if (s < reuse) result = nominalResults?.[s];
      else if (s < carry) result = hotResults[s];
      else if (sp.inputStage < 0 || input) {
        try {
          const args: HotArgs = keep
            ? {
                parts: (impedanceArgs[s] as ImpedanceArgs).parts,
                settings: sp.stage.settings,
                opamp: sp.opampIndex ? { ...sp.stage.opamp } : sp.stage.opamp,
                supplies,
                rails,
                load: loadFns[s],
              }
            : (hotArgs[s] as HotArgs);
          if (sp.opampIndex) {
            const op = args.opamp as MutableOpamp;
            for (let k = 0; k < opampKeys.length; k++) {
              const vi = sp.opampIndex[k] as number;
              if (vi >= 0) op[opampKeys[k] as OpampSpreadKey] = x[vi] as number;
            }
          }
          if (temperatureIndex >= 0) args.temperature = x[temperatureIndex] as number;
          if (!keep) {
            args.load = loadFns[s];
            if (input) args.input = input;
            // The captured nominal results are read again later: they must not share the trials' arrays.
            args.buffer = capture ? undefined : hotBuffers[s];
          }
          // The fault reaches its own stage only, and only for this evaluation.
          args.fault = fault && fault.stage === sp.stage.id ? fault : undefined;
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
  // The first stage a change of each variable can reach; 0 for the rails, the op-amp and the temperature (they reach every stage).
  // With loading, a stage's parts also reach the upstream stages whose outputs they load (`reach`).
  const varStage = Int32Array.from(variables, (v) => {
    const position = stagePosition.get(v.stage);
    return position === undefined ? 0 : (reach[position] as number);
  });
  const hotX = new Float64Array(variables.length);
  /** Stages whose hot results hold for `hotX` (0: none). */
  let hotValid = 0;
  return {
    variables,
    checks,
    nominal,
    evaluate(x, out, stages, reuse, fault) {
      out.fill(Number.NaN);
      const upTo = stages === undefined ? stagePlans.length : Math.max(0, Math.min(stagePlans.length, stages));
      let from = 0;
      if (reuse !== undefined && reuse > 0) {
        if (!nominalResults) {
          nominalResults = new Array(stagePlans.length);
          run(nominal, undefined, false, stagePlans.length, 0, nominalResults);
        }
        from = Math.min(reuse, upTo);
        // A stage after `from` whose parts load an earlier stage's output changes that one too.
        for (let s = from; s < stagePlans.length; s++) from = Math.min(from, reach[s] as number);
      }
      // Incremental evaluation: stages upstream of every variable that changed since the last
      // hot evaluation keep their results (their output arrays are untouched since). A search
      // that moves one part at a time re-evaluates only that part's stage and what follows.
      let carry = 0;
      if (hotValid > 0 && from === 0) {
        carry = Math.min(hotValid, upTo);
        for (let i = 0; i < x.length && carry > 0; i++) {
          if (x[i] !== hotX[i]) carry = Math.min(carry, Math.max(0, varStage[i] as number));
        }
      }
      // A faulted stage and those after it must be evaluated afresh, and their results hold for this fault only.
      const faulted = fault ? (stagePosition.get(fault.stage) ?? 0) : upTo;
      run(x, out, false, upTo, from, undefined, Math.min(carry, faulted), fault);
      hotX.set(x);
      hotValid = Math.min(upTo, faulted);
    },
    stageIndex(id) {
      return stagePosition.get(id) ?? -1;
    },
    loaders(id) {
      const at = stagePosition.get(id);
      if (at === undefined) return [];
      return stageIds.filter((_, s) => s > at && (reach[s] as number) <= at);
    },
    detail(x, stages, fault) {
      const d = run(x, undefined, true, stages === undefined ? stagePlans.length : Math.max(0, Math.min(stagePlans.length, stages)), 0, undefined, 0, fault);
      const values: Record<string, number> = { ...d.values };
      railIds.forEach((id, i) => {
        values[`rails.${id}.dc`] = x[i] ?? Number.NaN;
      });
      return { ...d, values };
    },
  };
}

/** A taker's `inputImpedance`, as the load function calls it. */
type TakerImpedance = (x: ImpedanceArgs, f: number) => Complex | undefined;

/** Places per output in a load function's memory of the current sample (2⁶: the place is a hash's top 6 bits, see `loadFunction`). */
const rememberedLoads = 64;
/** The bits of a frequency, to pick its place. */
const frequencyBits = new Float64Array(1);
const frequencyWords = new Uint32Array(frequencyBits.buffer);

/**
 * The load on each output of stage `s` (EvalInput.load), or undefined when nothing
 * with an impedance takes any of its outputs. Sums admittances: every downstream
 * input on that output and any external `loads.<output>` resistance, in parallel.
 * Allocation-light: it keeps its lists and allocates only the impedances the kinds
 * return and the one it gives back.
 *
 * A passive taker's input impedance asks for its own load, so one call recurses
 * down the chain: on a ladder of n loaded stages every stage asking its load at the
 * signal's harmonics cost n² steps per sample. Each load function therefore
 * remembers its answers for the current sample (`sample`, moved on by the chain
 * whenever the parts or rails change) in `rememberedLoads` places per output, each
 * frequency in the one place its bits pick: the first stage to ask at a harmonic
 * fills every stage below it, the next ones find it. A corner search's frequencies
 * are its own and may take a harmonic's place (it is then computed again). One
 * compare per call: a least-recently-used list of 16 cost more on a miss than the
 * misses it saved (measured on the 20-stage ladder of bench/plan-size.bench.ts).
 */
function loadFunction(
  stage: PlanStage,
  s: number,
  plans: readonly { readonly stage: PlanStage; readonly inputStage: number }[],
  impedanceArgs: readonly ImpedanceArgs[],
  sample: { readonly generation: number },
): ((output: string, f: number) => Complex | undefined) | undefined {
  const outputs = stage.module.outputs;
  const takers: number[][] = outputs.map((o) =>
    plans.flatMap((p, i) => (p.inputStage === s && p.stage.input?.output === o && p.stage.module.inputImpedance ? [i] : [])),
  );
  const external = outputs.map((o) => (Object.hasOwn(stage.parts, `${externalLoadPrefix}${o}`) ? `${externalLoadPrefix}${o}` : ''));
  if (takers.every((t) => t.length === 0) && external.every((e) => e === '')) return undefined;
  // Each taker's impedance function and arguments, looked up once (the calls run n² times down a ladder).
  const takerImpedance = takers.map((list) => list.map((t) => plans[t]?.stage.module.inputImpedance as unknown as TakerImpedance));
  const takerArgs = takers.map((list) => list.map((t) => impedanceArgs[t] as ImpedanceArgs));
  const places = outputs.length * rememberedLoads;
  const memoF = new Float64Array(places);
  // The sample each place was filled for (0: none yet; the chain's first sample is 1).
  const memoSample = new Float64Array(places);
  const memoZ: (Complex | undefined)[] = new Array(places).fill(undefined);
  const compute = (o: number, f: number): Complex | undefined => {
    let yre = 0;
    let yim = 0;
    let any = false;
    const fns = takerImpedance[o] as TakerImpedance[];
    const args = takerArgs[o] as ImpedanceArgs[];
    for (let k = 0; k < fns.length; k++) {
      const z = (fns[k] as TakerImpedance)(args[k] as ImpedanceArgs, f);
      if (!z || !Number.isFinite(z.re) || !Number.isFinite(z.im)) continue;
      const d = z.re * z.re + z.im * z.im;
      if (d === 0) return { re: 0, im: 0 };
      yre += z.re / d;
      yim -= z.im / d;
      any = true;
    }
    const role = external[o] as string;
    if (role !== '') {
      const r = (impedanceArgs[s] as ImpedanceArgs).parts[role] ?? Number.NaN;
      yre += 1 / r;
      any = true;
    }
    if (!any) return undefined;
    const d = yre * yre + yim * yim;
    if (d === 0) return undefined;
    return { re: yre / d, im: -yim / d };
  };
  return (output, f) => {
    const o = outputs.indexOf(output);
    if (o < 0) return undefined;
    frequencyBits[0] = f;
    // Both words mixed (a harmonic's multiple by a power of two differs only in its exponent), the top 6 bits kept.
    const k = o * rememberedLoads + (Math.imul((frequencyWords[0] as number) ^ (frequencyWords[1] as number), 0x9e3779b1) >>> 26);
    if (memoSample[k] === sample.generation && memoF[k] === f) return memoZ[k];
    // Kinds never change an impedance they are given: the remembered object is handed out as is.
    const z = compute(o, f);
    memoF[k] = f;
    memoZ[k] = z;
    memoSample[k] = sample.generation;
    return z;
  };
}
