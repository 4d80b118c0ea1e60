import { type Chain, spreadOf } from '../plan/chain.js';
import type { Contributor } from './types.js';

/**
 * Sensitivities of every check to every toleranced variable: `perSigma[v][c]` is
 * half the change of check c when variable v moves from −σ to +σ (σ = tol/3,
 * the normal model), all else nominal — a central difference, i.e. the
 * sensitivity coefficient times the standard uncertainty of JCGM 100:2008 §5.1.3.
 * Variables without tolerance get zeros.
 */
export function sensitivities(chain: Chain): Float64Array[] {
  const nCheck = chain.checks.length;
  const x = Float64Array.from(chain.nominal);
  const up = new Float64Array(nCheck);
  const down = new Float64Array(nCheck);
  return chain.variables.map((v, i) => {
    const d = new Float64Array(nCheck);
    const sigma = spreadOf(v) / 3;
    if (!(sigma > 0)) return d;
    x[i] = v.nominal + sigma;
    chain.evaluate(x, up);
    x[i] = v.nominal - sigma;
    chain.evaluate(x, down);
    x[i] = v.nominal;
    for (let c = 0; c < nCheck; c++) {
      const delta = ((up[c] as number) - (down[c] as number)) / 2;
      d[c] = Number.isFinite(delta) ? delta : 0;
    }
    return d;
  });
}

/**
 * The variables that make up most of a check's spread: each one's share of the
 * combined variance, (cᵢ·u(xᵢ))² / Σ (cⱼ·u(xⱼ))², the root-sum-square law of
 * propagation for uncorrelated inputs (JCGM 100:2008, eq. 10). Shares below 1 %
 * are left out; at most `top` are kept, largest first.
 */
export function contributorsOf(chain: Chain, perSigma: readonly Float64Array[], check: number, nominal: number, top = 3): Contributor[] {
  let total = 0;
  for (const d of perSigma) total += (d[check] ?? 0) ** 2;
  // A check that does not move (a symmetric duty) has only rounding noise to share out.
  if (!(total > 0) || Math.sqrt(total) <= 1e-9 * Math.max(Math.abs(nominal), 1e-30)) return [];
  return chain.variables
    .map((v, i) => ({ part: v.name, share: (perSigma[i]?.[check] ?? 0) ** 2 / total }))
    .filter((c) => c.share >= 0.01)
    .sort((a, b) => b.share - a.share)
    .slice(0, top);
}
