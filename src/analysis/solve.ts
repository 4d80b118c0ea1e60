/** Points of the log-spaced scan before bisection. */
const scanPoints = 40;

/**
 * The ratio r in [lo, hi] (lo > 0) for which f(r) = target, nearest to r = 1 in
 * log distance: a log-spaced scan finds every sign change of f − target, then
 * bisection on log r narrows each one. Non-finite values of f split the scan
 * (no root is assumed across them). Undefined when nothing in range reproduces
 * the target.
 */
export function solveForValue(f: (r: number) => number, target: number, lo: number, hi: number): number | undefined {
  const a = Math.log(lo);
  const b = Math.log(hi);
  const ln: number[] = [];
  const g: number[] = [];
  for (let k = 0; k <= scanPoints; k++) {
    const t = a + ((b - a) * k) / scanPoints;
    ln.push(t);
    g.push(f(Math.exp(t)) - target);
  }
  let best: number | undefined;
  const consider = (t: number): void => {
    if (best === undefined || Math.abs(t) < Math.abs(best)) best = t;
  };
  for (let k = 0; k < scanPoints; k++) {
    const g0 = g[k] as number;
    const g1 = g[k + 1] as number;
    if (!Number.isFinite(g0) || !Number.isFinite(g1)) continue;
    if (g0 === 0) consider(ln[k] as number);
    if (g0 * g1 >= 0) continue;
    let l = ln[k] as number;
    let r = ln[k + 1] as number;
    let gl = g0;
    // 1e-9 in ln r: far finer than any part tolerance.
    for (let it = 0; it < 60 && r - l > 1e-9; it++) {
      const m = (l + r) / 2;
      const gm = f(Math.exp(m)) - target;
      if (!Number.isFinite(gm)) break;
      if (gm === 0) {
        l = m;
        r = m;
        break;
      }
      if (gl * gm < 0) r = m;
      else {
        l = m;
        gl = gm;
      }
    }
    consider((l + r) / 2);
  }
  if ((g[scanPoints] ?? Number.NaN) === 0) consider(ln[scanPoints] as number);
  return best === undefined ? undefined : Math.exp(best);
}
