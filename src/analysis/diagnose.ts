import type { FaultMode, PartFaults } from '../circuit/types.js';
import { buildChain, type Chain, type ChainFault } from '../plan/chain.js';
import { upstreamOf } from '../plan/stages.js';
import type { Plan } from '../plan/types.js';
import type { Unit } from '../units/unit.js';
import { type DiagnosisReading, type Evidence, faultModeError, gatherEvidence, logLikelihood, reproduces, reproducesAll } from './diagnose-evidence.js';
import { hypothesisLabel, refOf, shortLabel } from './diagnose-labels.js';
import { type ValueClass, modePrior } from './diagnose-priors.js';
import { predict, searchValue } from './diagnose-search.js';
import { nextSeparating, separatingCheck } from './diagnose-next.js';
import { hintsFor } from './explain.js';
import type { DiagnosisTarget } from './diagnose-evidence.js';

export type { DiagnosisReading, DiagnosisTarget } from './diagnose-evidence.js';

/** A part (or rail) that could be wrong in another way and gives the same readings. */
export interface Alternative {
  readonly part: string;
  readonly ref: string | null;
  readonly mode: FaultMode;
  readonly value: number | null;
  readonly label: string;
  /** Which way the mode happened, in bench words, for parts that can fail one mode in several ways. */
  readonly variantWords: string | null;
  readonly score: number;
  /** Its predicted value for every check of the plan: the readings so far cannot tell it from the head, an unread check may. */
  readonly predictedAll: Readonly<Record<string, number>>;
}

/** One verified single-fault hypothesis (DESIGN §5a). */
export interface Hypothesis {
  readonly rank: number;
  /** `<stage>.<role>` or `rails.<id>`. */
  readonly part: string;
  readonly ref: string | null;
  readonly mode: FaultMode;
  /** The solved value in SI units for `value`, else null. */
  readonly value: number | null;
  readonly unit: Unit | null;
  /** For `value`: what kind of wrong value (neighbour, decade slip, …). */
  readonly valueClass: ValueClass | null;
  /** Which way the mode happened, for parts that can fail one mode in several ways. */
  readonly variant: number;
  /** The same in bench words, or null. */
  readonly variantWords: string | null;
  readonly label: string;
  /** The same in a few words, for a one-line panel. */
  readonly short: string;
  /** 0…1: prior × likelihood, normalised over the listed hypotheses. */
  readonly score: number;
  /** The readings outside their band (fail or marginal) this fault reproduces. */
  readonly explains: readonly string[];
  /** The fault's predicted value for every check read in the run. */
  readonly predicted: Readonly<Record<string, number>>;
  /** The fault's predicted value for every check of the plan (for choosing the next check). */
  readonly predictedAll: Readonly<Record<string, number>>;
  /** Other faults the readings cannot tell from this one (an R and a C of one RC product). */
  readonly alternatives: readonly Alternative[];
  /** What would tell this one from its alternatives. */
  readonly separate: string | null;
  readonly logLikelihood: number;
  readonly prior: number;
}

export interface Diagnosis {
  /** Ranked, most likely first (after grouping equivalent ones). */
  readonly hypotheses: readonly Hypothesis[];
  /** Readings outside their band that no single verified fault explains. */
  readonly unexplained: readonly string[];
  /** True when every reading passed: nothing to explain. */
  readonly allPass: boolean;
  /** The stages' fault hints for the failed checks, as text under the ranked list. */
  readonly hints: readonly { readonly check: string; readonly hints: readonly string[] }[];
  /** The unread check that best separates the hypotheses, if any. */
  readonly next: { readonly check: string; readonly why: string } | null;
}

export interface DiagnoseOptions {
  /** Keep at most this many hypotheses (after grouping). @default 10 */
  readonly top?: number;
  /** A chain already built for the plan (the screen keeps one). */
  readonly chain?: Chain;
}

interface Raw {
  readonly stage: string;
  readonly role: string;
  readonly part: string;
  readonly mode: FaultMode;
  readonly variant: number;
  readonly value: number | null;
  readonly unit: Unit | null;
  readonly valueClass: ValueClass | null;
  readonly description: string;
  readonly variantWords: string | null;
  readonly predicted: Float64Array;
  readonly logLikelihood: number;
  readonly prior: number;
  /** Extra relative model error the fault's predictions are held to (see `faultModeError`). */
  readonly extra: number;
}

/** Every non-value fault the plan's stages declare, with the part's words. */
function nonValueFaults(plan: Plan): { fault: ChainFault; description: string; variantWords: string | null }[] {
  const list: { fault: ChainFault; description: string; variantWords: string | null }[] = [];
  for (const stage of plan.stages) {
    const declared: readonly PartFaults[] = stage.module.faults?.(stage.settings) ?? [];
    const roles = new Set(stage.module.roles.map((r) => r.role));
    for (const pf of declared) {
      // A declared role the plan does not fit (an optional part left out) cannot be wrong.
      if (roles.has(pf.role) && !(pf.role in stage.parts)) continue;
      for (const mode of pf.modes) {
        const variants = pf.variants?.[mode] ?? [null];
        variants.forEach((words, variant) => {
          list.push({ fault: { stage: stage.id, role: pf.role, mode, variant }, description: pf.description, variantWords: words });
        });
      }
    }
  }
  return list;
}

/**
 * Diagnose a board from all the readings of one run (DESIGN §5a): every single
 * fault — each toleranced part's value (solved for), each declared open, short,
 * reversed or missing part, each rail's value — is evaluated through the whole
 * chain, kept only if it reproduces every reading (deviating or passing) within
 * the reading's uncertainty plus the model's error and the other parts' spread,
 * and ranked by prior × likelihood over all the readings. Faults the readings
 * cannot tell apart are grouped, with the check that would separate them.
 */
export function diagnose(plan: Plan, targets: readonly DiagnosisTarget[], readings: readonly DiagnosisReading[], options: DiagnoseOptions = {}): Diagnosis {
  const chain = options.chain ?? buildChain(plan);
  const { evidence, unmodelled } = gatherEvidence(plan, chain, targets, readings);
  const deviating = evidence.filter((e) => e.deviates);
  const unmodelledFails = unmodelled.filter((r) => r.verdict !== 'pass').map((r) => r.check);
  const hints = [...deviating.map((e) => e.check), ...unmodelledFails].map((check) => ({ check, hints: hintsFor(plan, check) }));
  if (deviating.length === 0) {
    return { hypotheses: [], unexplained: unmodelledFails, allPass: unmodelledFails.length === 0, hints, next: null };
  }

  // Causality: a part can only move the checks of its own stage and of stages downstream of it.
  const reach = new Map(
    plan.stages.map((s) => [s.id, new Set([s.id, ...plan.stages.filter((d) => upstreamOf(plan.stages, d.id).includes(s.id)).map((d) => d.id)])] as const),
  );
  const canExplain = (stage: string): boolean => stage === 'rails' || deviating.some((e) => reach.get(stage)?.has(e.stage) === true);
  const raws: Raw[] = [];
  chain.variables.forEach((v, i) => {
    const stage = plan.stages.find((s) => s.id === v.stage);
    if (stage && (stage.kind === 'manual' || stage.module.traits?.isHandWritten)) return;
    // A data-sheet figure (a regulator's reference) is never the wrong value fitted.
    if (stage?.module.roles.some((r) => r.role === v.role && r.isRating)) return;
    const found = searchValue(chain, i, evidence, canExplain);
    if (!found) return;
    const unit = v.unit;
    raws.push({
      stage: v.stage,
      role: v.role,
      part: v.name,
      mode: 'value',
      variant: 0,
      value: found.value,
      unit,
      valueClass: found.cls,
      description: stage?.module.roles.find((r) => r.role === v.role)?.description ?? (v.stage === 'rails' ? 'supply rail' : v.role),
      variantWords: null,
      predicted: found.predicted,
      logLikelihood: found.logLikelihood,
      prior: found.prior,
      extra: 0,
    });
  });
  for (const { fault, description, variantWords } of nonValueFaults(plan)) {
    if (!canExplain(fault.stage)) continue;
    const predicted = predict(chain, chain.nominal, chain.stageIndex(fault.stage), fault);
    if (!reproducesAll(evidence, predicted, faultModeError)) continue;
    raws.push({
      stage: fault.stage,
      role: fault.role,
      part: `${fault.stage}.${fault.role}`,
      mode: fault.mode,
      variant: fault.variant ?? 0,
      value: null,
      unit: null,
      valueClass: null,
      description,
      variantWords,
      predicted,
      logLikelihood: logLikelihood(evidence, predicted, faultModeError),
      prior: modePrior[fault.mode],
      extra: faultModeError,
    });
  }
  // A fault must explain something: one that reproduces the readings only because it changes nothing read is no cause.
  const causes = raws.filter((r) => deviating.some((e) => reproduces(e, r.predicted[e.index] as number, r.extra)));
  return rank(plan, chain, evidence, causes, hints, options.top ?? 10);
}

function rank(plan: Plan, chain: Chain, evidence: readonly Evidence[], raws: readonly Raw[], hints: Diagnosis['hints'], top: number): Diagnosis {
  const deviating = evidence.filter((e) => e.deviates);
  const weights = raws.map((r) => r.logLikelihood + Math.log(r.prior));
  const maxW = Math.max(...weights, -Infinity);
  const posts = weights.map((w) => Math.exp(w - maxW));
  const total = posts.reduce((s, x) => s + x, 0);
  const order = raws.map((_, i) => i).sort((a, b) => (weights[b] as number) - (weights[a] as number));

  // Group faults whose predictions for every read check agree to well inside the readings' spread.
  const groups: number[][] = [];
  for (const i of order) {
    const r = raws[i] as Raw;
    const home = groups.find((g) => evidence.every((e) => same(e, (raws[g[0] as number] as Raw).predicted[e.index] as number, r.predicted[e.index] as number)));
    if (home) home.push(i);
    else groups.push([i]);
  }
  const entry = (i: number) => {
    const r = raws[i] as Raw;
    const ref = refOf(plan, r.stage, r.role);
    return { r, ref, score: total > 0 ? (posts[i] as number) / total : 0, label: hypothesisLabel(chain, r, ref, deviating) };
  };
  // A group counts with all its members: faults the readings cannot tell apart share the evidence.
  const weightOf = (g: readonly number[]) => g.reduce((sum, i) => sum + (posts[i] as number), 0);
  groups.sort((a, b) => weightOf(b) - weightOf(a));
  const hypotheses: Hypothesis[] = groups.slice(0, top).map((g, n) => {
    const [head, ...rest] = g.map(entry);
    const h = head as ReturnType<typeof entry>;
    const record = (p: Float64Array, only?: readonly Evidence[]) => {
      const o: Record<string, number> = {};
      if (only) for (const e of only) o[e.check] = p[e.index] as number;
      else
        chain.checks.forEach((c, k) => {
          o[c.check] = p[k] as number;
        });
      return o;
    };
    const alternatives: Alternative[] = rest.map((a) => ({
      part: a.r.part,
      ref: a.ref,
      mode: a.r.mode,
      value: a.r.value,
      label: a.label,
      variantWords: a.r.variantWords,
      score: a.score,
      predictedAll: record(a.r.predicted),
    }));
    return {
      rank: n + 1,
      part: h.r.part,
      ref: h.ref,
      mode: h.r.mode,
      value: h.r.value,
      unit: h.r.unit,
      valueClass: h.r.valueClass,
      variant: h.r.variant,
      variantWords: h.r.variantWords,
      label: h.label,
      short: shortLabel(h.r, h.ref, deviating),
      score: h.score + rest.reduce((s, a) => s + a.score, 0),
      explains: deviating.filter((e) => reproduces(e, h.r.predicted[e.index] as number, h.r.extra)).map((e) => e.check),
      predicted: record(h.r.predicted, evidence),
      predictedAll: record(h.r.predicted),
      alternatives,
      separate: rest.length > 0 ? separatingCheck(plan, chain, evidence, [h.r, ...rest.map((a) => a.r)]) : null,
      logLikelihood: h.r.logLikelihood,
      prior: h.r.prior,
    };
  });
  const explained = new Set(hypotheses.flatMap((h) => h.explains));
  const unexplained = [
    ...deviating.filter((e) => !explained.has(e.check)).map((e) => e.check),
    ...hints.map((h) => h.check).filter((c) => !evidence.some((e) => e.check === c)),
  ];
  return { hypotheses, unexplained, allPass: false, hints, next: nextSeparating(plan, chain, evidence, hypotheses) };
}

/** Two predictions the reading cannot tell apart (a fifth of its standard deviation). */
function same(e: Evidence, a: number, b: number): boolean {
  if (Number.isFinite(a) !== Number.isFinite(b)) return false;
  if (!Number.isFinite(a)) return true;
  const tol = 0.2 * Math.max(e.u / 2, e.spread, 1e-12);
  return Math.abs(a - b) <= tol;
}
