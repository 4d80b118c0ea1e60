import type { Chain } from '../plan/chain.js';
import type { Plan } from '../plan/types.js';
import { formatValue } from '../units/format.js';
import { uncertaintyOf } from '../units/uncertainty.js';
import { uncertaintyKey } from '../units/unit.js';
import { type Evidence, modelErrorOf } from './diagnose-evidence.js';
import { refOf } from './diagnose-labels.js';
import { uncertaintyFor } from './verdict.js';

interface Predicting {
  readonly stage: string;
  readonly role: string;
  readonly part: string;
  readonly variantWords: string | null;
  readonly predicted: Float64Array;
}

/** A fault's name in a sentence: its part, and which way when the part can fail one mode in several. */
const nameOf = (f: Predicting): string => (f.variantWords ? `${f.part} (${f.variantWords})` : f.part);

/** How far apart two predictions of a check must be for one reading to tell them apart. */
function resolution(plan: Plan, chain: Chain, k: number, value: number): number {
  const c = chain.checks[k];
  if (!c) return Infinity;
  const spec = uncertaintyFor(plan, c.check, uncertaintyKey(c.unit));
  const v = Number.isFinite(value) ? value : 0;
  return 2 * ((spec ? uncertaintyOf(v, spec) : 0) + modelErrorOf(c.unit, v));
}

/** A check the technician can still make: a stage check not yet read, and not a design figure nobody probes (a regulator's dissipation). */
function readable(chain: Chain, k: number, read: ReadonlySet<string>): boolean {
  const c = chain.checks[k];
  return c !== undefined && c.phase === 'stage' && !c.isDesignFigure && !read.has(c.check);
}

/**
 * What tells equivalent faults apart: the unread check of the plan whose
 * predictions differ most against what a reading can resolve, or, when no
 * check does (an R and a C of one RC product move every check alike), the part
 * itself measured out of circuit.
 */
export function separatingCheck(plan: Plan, chain: Chain, evidence: readonly Evidence[], faults: readonly Predicting[]): string {
  const read = new Set(evidence.map((e) => e.check));
  const [a, b] = faults;
  if (a && b) {
    let best = -1;
    let bestK = -1;
    for (let k = 0; k < chain.checks.length; k++) {
      if (!readable(chain, k, read)) continue;
      const pa = a.predicted[k] as number;
      const pb = b.predicted[k] as number;
      const gap = Number.isFinite(pa) !== Number.isFinite(pb) ? Infinity : Math.abs(pa - pb) / resolution(plan, chain, k, (pa + pb) / 2);
      if (Number.isFinite(pa) || Number.isFinite(pb)) {
        if (gap > best) {
          best = gap;
          bestK = k;
        }
      }
    }
    const c = chain.checks[bestK];
    if (c && best > 1) {
      return `read ${c.check}${c.testPoint ? ` at ${c.testPoint}` : ''}: ${nameOf(a)} predicts ${formatValue(a.predicted[bestK] as number, c.unit)}, ${nameOf(b)} ${formatValue(b.predicted[bestK] as number, c.unit)}`;
    }
  }
  const names = faults.map((f) => `${f.part}${refOf(plan, f.stage, f.role) ? ` (${refOf(plan, f.stage, f.role)})` : ''}`);
  return `no check of the plan tells ${names.join(' from ')}: power off and check them in place (an ohmmeter across a resistor, the diode test across a junction, a capacitance meter with one leg lifted)`;
}

/** Entropy in bits of a set of weights (normalised here). */
function entropy(weights: readonly number[]): number {
  const total = weights.reduce((s, w) => s + w, 0);
  let h = 0;
  for (const w of weights) if (w > 0) h -= (w / total) * Math.log2(w / total);
  return h;
}

/**
 * The unread check that best separates the hypotheses: the expected information
 * of its reading, taken as the entropy (bits) of the hypotheses' weights once
 * grouped by which outcomes a reading could tell apart (two predictions closer
 * than a reading resolves fall in one group). Ties go to plan order. Null when
 * no unread check separates them (or fewer than two remain).
 */
export function nextSeparating(
  plan: Plan,
  chain: Chain,
  evidence: readonly Evidence[],
  hypotheses: readonly {
    readonly score: number;
    readonly predictedAll: Readonly<Record<string, number>>;
    readonly alternatives?: readonly { readonly score: number; readonly predictedAll: Readonly<Record<string, number>> }[];
  }[],
): { check: string; why: string } | null {
  // Every fault on its own, grouped ones too: the readings so far cannot tell them apart, an unread check may.
  const faults = hypotheses.flatMap((h) => [
    { score: h.score - (h.alternatives ?? []).reduce((s, a) => s + a.score, 0), predictedAll: h.predictedAll },
    ...(h.alternatives ?? []),
  ]);
  if (faults.length < 2) return null;
  const read = new Set(evidence.map((e) => e.check));
  let best = 1e-6;
  let pick: { check: string; why: string } | null = null;
  for (let k = 0; k < chain.checks.length; k++) {
    if (!readable(chain, k, read)) continue;
    const c = chain.checks[k];
    if (!c) continue;
    const groups: { value: number; weight: number }[] = [];
    for (const h of faults) {
      const v = h.predictedAll[c.check] ?? Number.NaN;
      const home = groups.find((g) =>
        Number.isFinite(g.value) ? Number.isFinite(v) && Math.abs(g.value - v) <= resolution(plan, chain, k, v) : !Number.isFinite(v),
      );
      if (home) home.weight += h.score;
      else groups.push({ value: v, weight: h.score });
    }
    const bits = entropy(groups.map((g) => g.weight));
    if (bits > best + 1e-9) {
      best = bits;
      pick = {
        check: c.check,
        why: `${c.check}${c.testPoint ? ` at ${c.testPoint}` : ''} tells the likely faults apart best (${groups.length} distinct outcomes, ${bits.toFixed(2)} bits expected)`,
      };
    }
  }
  return pick;
}
