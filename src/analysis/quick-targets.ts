import { buildChain } from '../plan/chain.js';
import type { Plan } from '../plan/types.js';
import { sensitivities } from './sensitivity.js';
import { assembleTargets } from './targets.js';
import type { TargetSet } from './types.js';

/**
 * A plan's targets in a few milliseconds, for a screen that follows every
 * keystroke (the plan editor): the nominal of every check exactly, as in
 * `computeTargets`, and bands estimated from the sensitivities alone (two chain
 * evaluations per variable) instead of the worst-case search and the Monte Carlo:
 *
 * - worst case, linearised: nominal ± Σ |cᵢ|·Δxᵢ, each variable at the end of
 *   its box (the first-order worst case of any tolerance-analysis text; exact
 *   for a check linear in its parts, short where a check bends or turns over);
 * - statistical: nominal ± 3·√Σ (cᵢ·u(xᵢ))², the root-sum-square law of
 *   propagation (JCGM 100:2008, eq. 10) at the ±3σ of the normal model, held
 *   inside the linear worst case.
 *
 * The set says it is an estimate (`isEstimate`); callers replace it with the
 * full computation, which they run after it (the editor: in a worker).
 */
export function quickTargets(plan: Plan): TargetSet {
  const chain = buildChain(plan);
  const nominalDetail = chain.detail(chain.nominal);
  const nominalOut = Float64Array.from(chain.checks, (c) => nominalDetail.values[c.check] ?? Number.NaN);
  const perSigma = sensitivities(chain);
  const n = chain.checks.length;
  const min = new Float64Array(n);
  const max = new Float64Array(n);
  const rss = new Float64Array(n);
  for (let c = 0; c < n; c++) {
    let linear = 0;
    let squares = 0;
    for (const d of perSigma) {
      // perSigma is the change at one σ = a third of the half-width (sensitivity.ts).
      const at = d[c] ?? 0;
      linear += 3 * Math.abs(at);
      squares += at * at;
    }
    const nominal = nominalOut[c] as number;
    // A quantity with a physical floor (a THD, a dead band) never estimates below it.
    const floor = chain.checks[c]?.floor ?? -Infinity;
    min[c] = Math.max(floor, nominal - linear);
    max[c] = nominal + linear;
    rss[c] = 3 * Math.sqrt(squares);
  }
  const worst = { min, max, method: [], evaluations: 0 };
  const prepared = { plan, chain, nominalDetail, nominalOut, perSigma, worst };
  const stat = (i: number) => ({
    low: Math.max(chain.checks[i]?.floor ?? -Infinity, (nominalOut[i] as number) - (rss[i] as number)),
    high: (nominalOut[i] as number) + (rss[i] as number),
  });
  return { ...assembleTargets(prepared, stat, new Int32Array(n), 1), isEstimate: true };
}
