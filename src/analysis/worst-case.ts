import type { Chain } from '../plan/chain.js';

/** Up to this many toleranced variables, the worst case visits every corner (2^n chain evaluations). */
export const maxCornerVariables = 10;

/**
 * Extremes of every check over the tolerance box. With few toleranced variables
 * every corner is evaluated; otherwise, for each check, the two corners that the
 * signs of its sensitivities point to (each variable to the end that raises the
 * check, then to the end that lowers it). Every evaluated corner lies inside the
 * box, so its values widen every check's band, not only its own.
 * Returns per check [min, max] (NaN when never finite).
 */
export function worstCase(chain: Chain, perSigma: readonly Float64Array[]): { min: Float64Array; max: Float64Array; evaluations: number } {
  const nCheck = chain.checks.length;
  const min = new Float64Array(nCheck).fill(Infinity);
  const max = new Float64Array(nCheck).fill(-Infinity);
  const out = new Float64Array(nCheck);
  const x = Float64Array.from(chain.nominal);
  const varied = chain.variables.flatMap((v, i) => (v.tol > 0 ? [i] : []));
  let evaluations = 0;
  const take = (): void => {
    chain.evaluate(x, out);
    evaluations++;
    for (let c = 0; c < nCheck; c++) {
      const v = out[c] as number;
      if (!Number.isFinite(v)) continue;
      if (v < (min[c] as number)) min[c] = v;
      if (v > (max[c] as number)) max[c] = v;
    }
  };
  const setEnd = (i: number, sign: number): void => {
    const v = chain.variables[i];
    if (v) x[i] = v.nominal * (1 + sign * v.tol);
  };
  take();
  if (varied.length <= maxCornerVariables) {
    const corners = 1 << varied.length;
    for (let m = 0; m < corners; m++) {
      for (let k = 0; k < varied.length; k++) setEnd(varied[k] as number, (m >> k) & 1 ? 1 : -1);
      take();
    }
  } else {
    for (let c = 0; c < nCheck; c++) {
      for (const direction of [1, -1]) {
        for (const i of varied) {
          const d = perSigma[i]?.[c] ?? 0;
          setEnd(i, d === 0 ? 0 : Math.sign(d) * direction);
        }
        take();
      }
    }
  }
  for (let c = 0; c < nCheck; c++) {
    if (min[c] === Infinity) {
      min[c] = Number.NaN;
      max[c] = Number.NaN;
    }
  }
  return { min, max, evaluations };
}
