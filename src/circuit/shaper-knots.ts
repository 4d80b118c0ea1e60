import { lambertFromTable, lambertTable, tableFirst, tableIntervals, tablePerUnit } from './lambert-w.js';
import type { ShaperBranch, ShaperNet } from './shaper-solver.js';

/**
 * The shaper's node at evenly spaced input levels (the knots of a trial's
 * transfer curve, see `solveTransfer`), by Newton's method on the node voltage
 * alone. A branch's current is explicit in the voltage u across it: a diode
 * string (IS, N·Vt, its resistance R) carries
 *   I = (N·Vt/R)·W(p·e^(p + u/(N·Vt))) − IS,  p = R·IS/(N·Vt)
 * (Shockley law with a series resistance solved by Lambert's W, as Banwell and
 * Jayakumar published it in Electronics Letters in 2000; the reference from memory,
 * the form checked in the tests against the closed form V(I) of diode.ts), with
 * dI/du = (1/R)·w/(1 + w).
 * W comes from a table (lambert-w.ts), so a Newton step costs no exponential,
 * where the joint solve of `solveNode` takes one per branch.
 *
 * The walk starts at the knot nearest 0 V input (usually every branch off, the
 * node linear) and goes up, then down, each start extrapolated from the two
 * knots before it (their values and the last slope); every step stays inside
 * the bracket the node's current has shown so far (bisection otherwise). A
 * step under `tolerance` ends a knot, as in `solveNode` (about 1 µV left).
 * `values[j]` and `slopes[j]` (dv/dvin) are written for each of the `k` knots
 * `lo + j·h` (the last one exactly `hi`). Returns the number of Newton steps.
 */
export function solveKnots(
  net: ShaperNet,
  lo: number,
  hi: number,
  k: number,
  values: Float64Array,
  slopes: Float64Array,
  tolerance: number,
  fallback: (net: ShaperNet, vin: number) => number,
): number {
  const table = lambertTable();
  const nb = net.branches.length;
  if (scratch.length < 8 * nb) scratch = new Float64Array(8 * nb);
  // Per branch, 8 slots: sign, bias, 1/(N·Vt), ln p + p, N·Vt/R, IS, 1/R (one spare).
  const s = scratch;
  for (let b = 0; b < nb; b++) {
    const br = net.branches[b] as ShaperBranch;
    const d = br.diodes;
    const p = (d.r * d.is) / d.nvt;
    const o = 8 * b;
    s[o] = br.sign;
    s[o + 1] = br.bias;
    s[o + 2] = 1 / d.nvt;
    s[o + 3] = Math.log(p) + p;
    s[o + 4] = d.nvt / d.r;
    s[o + 5] = d.is;
    s[o + 6] = 1 / d.r;
  }
  const { gs, gl } = net;
  const il = net.il ?? 0;
  const intervals = k - 1;
  // The ends as raw doubles (an argument is a boxed number: a conditional that picks it or a
  // computed level boxed the level on every knot, measured).
  const top = hi * 1;
  const bottom = lo * 1;
  const h = (top - bottom) / intervals;
  let steps = 0;
  // Knot nearest 0 V input, then up to the top and down to the bottom.
  const m = Math.min(intervals, Math.max(0, Math.round(-bottom / h)));
  for (let pass = 0; pass < 2; pass++) {
    const begin = pass === 0 ? m : m - 1;
    const end = pass === 0 ? k : -1;
    const dir = pass === 0 ? 1 : -1;
    for (let j = begin; j !== end; j += dir) {
      const vin = j === intervals ? top : bottom + j * h;
      // The start: linear at the first knot, else along the curve from the knots before.
      let v: number;
      const back = j - dir;
      const back2 = j - 2 * dir;
      if (pass === 0 && j === m) v = (vin * gs + il) / (gs + gl);
      else {
        const step = vin - (back === intervals ? top : bottom + back * h);
        const v1 = values[back] as number;
        const s1 = slopes[back] as number;
        // Quadratic through the last knot's value and slope and the one before it, once both are solved.
        const hasTwo = pass === 0 ? back2 >= m : back2 <= intervals;
        v = hasTwo ? (values[back2] as number) + 2 * step * s1 : v1 + step * s1;
        if (!Number.isFinite(v)) v = (vin * gs + il) / (gs + gl);
      }
      let below = -Infinity;
      let above = Infinity;
      let den = gs + gl;
      let settled = false;
      for (let it = 0; it < 60; it++) {
        steps++;
        let f = gs * (vin - v) - gl * v + il;
        den = gs + gl;
        for (let b = 0; b < nb; b++) {
          const o = 8 * b;
          const sign = s[o] as number;
          const L = (s[o + 3] as number) + sign * (v - (s[o + 1] as number)) * (s[o + 2] as number);
          // lambertFromTable, written out: a call here passed L boxed on every step (measured).
          const u = (L - tableFirst) * tablePerUnit;
          let w = 0;
          if (u >= 0 && u < tableIntervals) {
            const q = u | 0;
            const t = u - q;
            const c = q << 2;
            w = (table[c] as number) + t * ((table[c + 1] as number) + t * ((table[c + 2] as number) + t * (table[c + 3] as number)));
          } else if (u >= tableIntervals) w = lambertFromTable(table, L);
          f -= sign * ((s[o + 4] as number) * w - (s[o + 5] as number));
          den += ((s[o + 6] as number) * w) / (1 + w);
        }
        // The node's current falls as v rises: the root lies above v when it is positive.
        if (f > 0) below = v;
        else above = v;
        let next = v + f / den;
        if (!(next > below && next < above)) next = Number.isFinite(below) && Number.isFinite(above) ? 0.5 * (below + above) : next;
        const dv = next - v;
        v = next;
        if ((dv < 0 ? -dv : dv) < tolerance && Number.isFinite(v)) {
          settled = true;
          break;
        }
      }
      if (!settled) {
        // Kept apart from v: a call's result in the same variable made the optimiser box v on every step.
        values[j] = fallback(net, vin);
        slopes[j] = 0;
        continue;
      }
      values[j] = v;
      slopes[j] = gs / den;
    }
  }
  return steps;
}

let scratch = new Float64Array(64);
