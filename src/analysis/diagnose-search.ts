import type { Chain, ChainFault, ChainVariable } from '../plan/chain.js';
import { type Evidence, logLikelihood, reproduces, reproducesAll } from './diagnose-evidence.js';
import { classify, discreteCandidates, type ValueClass, valuePrior } from './diagnose-priors.js';

/** One evaluated single fault: its predictions for every check of the chain. */
export interface Trial {
  readonly predicted: Float64Array;
  readonly logLikelihood: number;
  readonly prior: number;
  readonly verified: boolean;
}

/** Evaluate the chain for one sample and one optional fault, keeping every check's value. */
export function predict(chain: Chain, x: Float64Array, reuse: number, fault?: ChainFault): Float64Array {
  const out = new Float64Array(chain.checks.length);
  chain.evaluate(x, out, undefined, reuse, fault);
  return out;
}

/**
 * Whether the predictions move smoothly around a solved value: at ±0.3 % of it
 * every read check must keep its "has a value" state and stay reproduced by the
 * same readings. A value sitting at a jump (an oscillator that stops just
 * beyond it) fails: it is the edge of a discontinuity, not an explanation.
 */
function continuous(chain: Chain, x: Float64Array, i: number, value: number, reuse: number, evidence: readonly Evidence[], at: Float64Array): boolean {
  const keep = x[i] as number;
  try {
    for (const step of [0.997, 1.003]) {
      x[i] = value * step;
      const p = predict(chain, x, reuse);
      for (const e of evidence) {
        const a = at[e.index] as number;
        const b = p[e.index] as number;
        if (Number.isFinite(a) !== Number.isFinite(b)) return false;
        if (reproduces(e, a) !== reproduces(e, b)) return false;
      }
    }
    return true;
  } finally {
    x[i] = keep;
  }
}

export interface ValueResult extends Trial {
  readonly value: number;
  readonly cls: ValueClass;
}

/** Scan points of the continuous solve (log-spaced) and golden-section steps per minimum. */
const scanPoints = 24;
const refineSteps = 13;
/** How far the continuous solve reaches either side of the fitted value (ratio). */
export const valueReach = 30;

function range(v: ChainVariable): [number, number] {
  if (v.stage === 'rails') return [0.05, 1.5];
  // A silicon junction drops 0.55–0.8 V whatever is wrong with it, and a current gain strays within a factor
  // of two (common practice, no source); zener and bias voltages may be anything another part gives.
  if (v.unit === 'V' && /(^|\.)(vbe|vd|vf2?)$/.test(v.role)) return [0.8, 1.25];
  if (v.unit === 'V/V') return [0.5, 2];
  if (v.unit === 'V') return [0.2, 5];
  return [1 / valueReach, valueReach];
}

/**
 * The best wrong value of one part (DESIGN §5a): the decade slips and series
 * neighbours of the fitted value, then a continuous 1-D solve — a log-spaced
 * scan of the misfit (−log-likelihood over every reading) and golden-section
 * refinement of each local minimum, each minimum also snapped to the nearest
 * standard value. Every candidate is re-evaluated through the whole chain and
 * kept only if it reproduces every reading and is no jump's edge; the kept one
 * with the highest prior × likelihood wins. Undefined when none is kept.
 */
export function searchValue(
  chain: Chain,
  i: number,
  evidence: readonly Evidence[],
  canExplain: (stage: string) => boolean = () => true,
): ValueResult | undefined {
  const v = chain.variables[i] as ChainVariable;
  if (!(v.nominal !== 0) || !Number.isFinite(v.nominal) || !canExplain(v.stage)) return undefined;
  const x = Float64Array.from(chain.nominal);
  const reuse = v.stage === 'rails' ? 0 : chain.stageIndex(v.stage);
  const at = (value: number): Float64Array => {
    x[i] = value;
    const p = predict(chain, x, reuse);
    x[i] = v.nominal;
    return p;
  };
  const misfit = (lnRatio: number): number => -logLikelihood(evidence, at(v.nominal * Math.exp(lnRatio)));

  const candidates = discreteCandidates(v);
  const [lo, hi] = range(v);
  const a = Math.log(lo);
  const b = Math.log(hi);
  const grid: number[] = [];
  const cost: number[] = [];
  for (let k = 0; k <= scanPoints; k++) {
    const t = a + ((b - a) * k) / scanPoints;
    grid.push(t);
    cost.push(misfit(t));
  }
  // A part that moves no reading anywhere in its range explains nothing: skip the refinement.
  const flat = Math.max(...cost) - Math.min(...cost) < 1e-6;
  for (let k = 0; flat === false && k <= scanPoints; k++) {
    const c = cost[k] as number;
    if (!(c <= (cost[k - 1] ?? Infinity) && c <= (cost[k + 1] ?? Infinity))) continue;
    // Golden-section search on [grid[k−1], grid[k+1]].
    let l = grid[Math.max(0, k - 1)] as number;
    let r = grid[Math.min(scanPoints, k + 1)] as number;
    const g = (Math.sqrt(5) - 1) / 2;
    let m1 = r - g * (r - l);
    let m2 = l + g * (r - l);
    let f1 = misfit(m1);
    let f2 = misfit(m2);
    for (let it = 0; it < refineSteps; it++) {
      if (f1 < f2) {
        r = m2;
        m2 = m1;
        f2 = f1;
        m1 = r - g * (r - l);
        f1 = misfit(m1);
      } else {
        l = m1;
        m1 = m2;
        f1 = f2;
        m2 = l + g * (r - l);
        f2 = misfit(m2);
      }
    }
    const value = v.nominal * Math.exp((l + r) / 2);
    candidates.push({ value, cls: v.stage === 'rails' ? 'rail' : 'off-standard' });
    const snapped = classify(v, value);
    if (snapped.cls !== 'off-standard' && snapped.cls !== 'rail') candidates.push(snapped);
  }

  const kept: ValueResult[] = [];
  for (const c of candidates) {
    const ratio = c.value / v.nominal;
    // Inside its own tolerance a part is not wrong: that is the healthy board's spread.
    if (Math.abs(ratio - 1) <= v.tol + 1e-9) continue;
    const predicted = at(c.value);
    if (!reproducesAll(evidence, predicted)) continue;
    kept.push({
      value: c.value,
      cls: c.cls,
      predicted,
      logLikelihood: logLikelihood(evidence, predicted),
      prior: valuePrior(c.cls, ratio, v.unit),
      verified: true,
    });
  }
  kept.sort((p, q) => q.logLikelihood + Math.log(q.prior) - (p.logLikelihood + Math.log(p.prior)));
  // The most probable candidate that is no jump's edge.
  const best = kept.find((k) => continuous(chain, x, i, k.value, reuse, evidence, k.predicted));
  return best;
}
