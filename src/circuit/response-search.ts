/**
 * Root finding on a logarithmic frequency axis for the filter figures (the
 * phase crossing of f0, the −3 dB points, the band-pass peak). Each call of `g`
 * solves the network once, so the searches bracket on a coarse grid and then
 * close in with the Illinois variant of regula falsi (superlinear, never leaves
 * its bracket), to a relative width of `rtol` in frequency.
 */
export function findRoot(g: (f: number) => number, lo: number, hi: number, rtol = 1e-9): number {
  let a = Math.log(lo);
  let b = Math.log(hi);
  let ga = g(lo);
  let gb = g(hi);
  if (ga === 0) return lo;
  if (gb === 0) return hi;
  if (!(ga * gb < 0)) return Number.NaN;
  for (let i = 0; i < 100 && Math.abs(b - a) > rtol; i++) {
    const c = (a * gb - b * ga) / (gb - ga);
    const gc = g(Math.exp(c));
    if (gc === 0) return Math.exp(c);
    if (gc * gb < 0) {
      a = b;
      ga = gb;
    } else ga /= 2;
    b = c;
    gb = gc;
  }
  return Math.exp((a + b) / 2);
}

/**
 * The first sign change of `g` walking from `from` towards `to` in steps of
 * `ratio` (up or down), refined by `findRoot`; NaN when there is none.
 */
export function firstCrossing(g: (f: number) => number, from: number, to: number, ratio = 1.2, rtol = 1e-9): number {
  const up = to > from;
  const step = up ? ratio : 1 / ratio;
  let f0 = from;
  let g0 = g(f0);
  while (up ? f0 < to : f0 > to) {
    const f1 = up ? Math.min(to, f0 * step) : Math.max(to, f0 * step);
    const g1 = g(f1);
    if (g0 === 0) return f0;
    if (g0 * g1 < 0 || g1 === 0) return up ? findRoot(g, f0, f1, rtol) : findRoot(g, f1, f0, rtol);
    f0 = f1;
    g0 = g1;
  }
  return Number.NaN;
}

/** Golden-section search for the maximum of `g` between lo and hi (log axis). */
export function findPeak(g: (f: number) => number, lo: number, hi: number, rtol = 1e-7): number {
  const r = (Math.sqrt(5) - 1) / 2;
  let a = Math.log(lo);
  let b = Math.log(hi);
  let c = b - r * (b - a);
  let d = a + r * (b - a);
  let gc = g(Math.exp(c));
  let gd = g(Math.exp(d));
  while (Math.abs(b - a) > rtol) {
    if (gc > gd) {
      b = d;
      d = c;
      gd = gc;
      c = b - r * (b - a);
      gc = g(Math.exp(c));
    } else {
      a = c;
      c = d;
      gc = gd;
      d = a + r * (b - a);
      gd = g(Math.exp(d));
    }
  }
  return Math.exp((a + b) / 2);
}

/**
 * The sign change of `g` nearest to `center` (log axis), stepping out on both
 * sides by `ratio` up to `reach` either way, refined by `findRoot`; NaN when
 * there is none. For functions with one crossing near a known estimate (the
 * phase point and the −3 dB point of a second-order section), this needs a
 * few solves where a walk from far below needs tens.
 */
export function nearestCrossing(g: (f: number) => number, center: number, ratio = 1.3, reach = 1000, rtol = 1e-9): number {
  const gc = g(center);
  if (gc === 0) return center;
  let lo = center;
  let hi = center;
  let glo = gc;
  let ghi = gc;
  while (hi / center < reach) {
    const up = hi * ratio;
    const gu = g(up);
    if (gu * ghi <= 0) return findRoot(g, hi, up, rtol);
    hi = up;
    ghi = gu;
    const down = lo / ratio;
    const gd = g(down);
    if (gd * glo <= 0) return findRoot(g, down, lo, rtol);
    lo = down;
    glo = gd;
  }
  return Number.NaN;
}
