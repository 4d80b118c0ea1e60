import type { FaultMode } from '../circuit/types.js';
import type { Chain } from '../plan/chain.js';
import type { Plan } from '../plan/types.js';
import { formatValue } from '../units/format.js';
import type { Unit } from '../units/unit.js';
import { type Evidence, sigmaOf } from './diagnose-evidence.js';
import type { ValueClass } from './diagnose-priors.js';

/** What a label needs of a hypothesis. */
export interface Labelled {
  readonly stage: string;
  readonly role: string;
  readonly part: string;
  readonly mode: FaultMode;
  readonly value: number | null;
  readonly unit: Unit | null;
  readonly valueClass: ValueClass | null;
  readonly description: string;
  readonly variantWords: string | null;
  readonly predicted: Float64Array;
}

/**
 * The reference designator of a stage's part from the plan's `refs`: the role
 * itself, else its group (`clamp.vz` → `clamp`, `branches[1].R` → `branches[1]`).
 * Null for rails and for parts the plan names no designator for.
 */
export function refOf(plan: Plan, stage: string, role: string): string | null {
  const refs = plan.stages.find((s) => s.id === stage)?.refs;
  if (!refs) return null;
  if (refs[role] !== undefined) return refs[role];
  const head = role.replace(/\.[^.]*$/, '');
  return head !== role && refs[head] !== undefined ? refs[head] : null;
}

const modeWords: Readonly<Record<FaultMode, string>> = { value: 'wrong value', open: 'open', short: 'shorted', reversed: 'reversed', missing: 'not fitted' };

function classWords(cls: ValueClass | null, ratio: number, fitted: string): string {
  switch (cls) {
    case 'decade':
    case 'decade2':
      return `${ratio > 1 ? `×${Math.round(ratio)}` : `1/${Math.round(1 / ratio)}`} the fitted ${fitted}: a decade slip, check the marking`;
    case 'neighbour':
      return `the series neighbour of the fitted ${fitted}: check the value fitted`;
    case 'standard':
      return `a standard value, not the fitted ${fitted}: a part from the wrong reel?`;
    case 'rail':
      return `not the planned ${fitted}: check the supply setting and the regulator`;
    default:
      return `no standard value (fitted ${fitted}): a damaged or drifted part, or a poor joint`;
  }
}

/**
 * The reading a label quotes: the one that stands out most among the deviating
 * readings of the fault's own stage (where the technician would look first),
 * else among all of them.
 */
export function headline(deviating: readonly Evidence[], stage?: string): Evidence | undefined {
  const own = deviating.filter((e) => e.stage === stage);
  let best: Evidence | undefined;
  let worst = -1;
  for (const e of own.length > 0 ? own : deviating) {
    const z = Math.abs(e.value - e.target.nominal) / sigmaOf(e, e.target.nominal);
    if (z > worst) {
      worst = z;
      best = e;
    }
  }
  return best;
}

/** A prediction in bench words: a value, or "no signal" where the fault leaves none. */
export function predictedWords(value: number, unit: Unit): string {
  return Number.isFinite(value) ? formatValue(value, unit) : 'nothing (no signal)';
}

const shortClass: Readonly<Record<ValueClass, string>> = {
  decade: 'decade slip',
  decade2: 'two-decade slip',
  neighbour: 'series neighbour',
  standard: 'wrong reel?',
  'off-standard': 'no standard value',
  rail: 'rail off',
};

/** The same in a few words for a one-line panel: `osc.Ct (C7) 220 nF (decade slip): osc.freq would read 113 Hz`. */
export function shortLabel(h: Labelled, ref: string | null, deviating: readonly Evidence[]): string {
  const name = `${h.part}${ref ? ` (${ref})` : ''}`;
  const what =
    h.mode === 'value' && h.value !== null && h.unit
      ? `${formatValue(h.value, h.unit, { digits: 3 })}${h.valueClass ? ` (${shortClass[h.valueClass]})` : ''}`
      : `${modeWords[h.mode]}${h.variantWords ? ` (${h.variantWords})` : ''}`;
  const e = headline(deviating, h.stage);
  return e ? `${name} ${what}: ${e.check} would read ${predictedWords(h.predicted[e.index] as number, e.unit)}` : `${name} ${what}`;
}

/**
 * A hypothesis in bench words with its designator, e.g.
 * * `osc.clamp (D3/D4) reversed — zener pair, high-side zener backwards: osc.square.high would read 1.3 V`.
 */
export function hypothesisLabel(chain: Chain, h: Labelled, ref: string | null, deviating: readonly Evidence[]): string {
  const name = `${h.part}${ref ? ` (${ref})` : ''}`;
  let what: string;
  if (h.mode === 'value' && h.value !== null && h.unit) {
    const v = chain.variables.find((x) => x.name === h.part);
    const fitted = v ? formatValue(v.nominal, v.unit) : '?';
    what = `${name} would be ${formatValue(h.value, h.unit)}, ${classWords(h.valueClass, v ? h.value / v.nominal : 1, fitted)}`;
  } else {
    what = `${name} ${modeWords[h.mode]} — ${h.variantWords ? `${h.description}, ${h.variantWords}` : h.description}`;
  }
  const e = headline(deviating, h.stage);
  return e ? `${what}: ${e.check} would read ${predictedWords(h.predicted[e.index] as number, e.unit)}` : what;
}
