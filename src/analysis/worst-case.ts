import { type Chain, spreadOf } from '../plan/chain.js';

/**
 * How a check's worst-case band was bound (`targets --json` key `method`):
 * - `corners`: every corner of the box of the variables that move it was
 *   evaluated, and a local search from the best corners found nothing beyond;
 * - `monotone`: too many variables for every corner; the corner its
 *   sensitivities point to was confirmed locally (no single variable moved to
 *   its other end or to its middle goes further), as for a check that moves
 *   one way with every part;
 * - `search`: the check is not monotone (a variable's middle or other end
 *   went further than the sensitivity corner), so the band is the best of a
 *   multi-start coordinate search over the box (with pattern steps inside the
 *   box where a variable's middle went further than its ends).
 */
export type BoundMethod = 'corners' | 'monotone' | 'search';

/** Up to this many variables move a stage's checks, the worst case visits every corner of their box (2^n evaluations). */
export const maxCornerVariables = 10;

export interface WorstCaseOptions {
  /** Corner enumeration up to this many relevant variables. @default maxCornerVariables */
  readonly maxCornerVariables?: number;
  /**
   * Stage ids upstream of a stage (its input's stage, that one's, …). Without it
   * every stage before a stage in chain order counts as upstream (safe, slower).
   */
  readonly upstream?: (stage: string) => readonly string[];
}

/** A stage's checks and the variables that can move them. */
interface Group {
  /** Stages to evaluate (chain order) for these checks to have values. */
  readonly depth: number;
  readonly checks: readonly number[];
  readonly variables: readonly number[];
}

/** Checks grouped by stage (rails first), each with the variables upstream of it. */
function groups(chain: Chain, upstream: WorstCaseOptions['upstream']): Group[] {
  const stageOrder: string[] = [];
  for (const c of chain.checks) if (c.stage !== 'rails' && !stageOrder.includes(c.stage)) stageOrder.push(c.stage);
  stageOrder.sort((a, b) => chain.stageIndex(a) - chain.stageIndex(b));
  const global = new Set(['rails', 'opamp', 'temperature']);
  const out: Group[] = [];
  const railChecks = chain.checks.flatMap((c, i) => (c.stage === 'rails' ? [i] : []));
  out.push({ depth: 0, checks: railChecks, variables: chain.variables.flatMap((v, i) => (v.stage === 'rails' ? [i] : [])) });
  for (const id of stageOrder) {
    const index = chain.stageIndex(id);
    const before = upstream ? new Set([id, ...upstream(id)]) : undefined;
    const isUpstream = (stage: string): boolean =>
      global.has(stage) || (before ? before.has(stage) : chain.stageIndex(stage) >= 0 && chain.stageIndex(stage) <= index);
    out.push({
      depth: index + 1,
      checks: chain.checks.flatMap((c, i) => (c.stage === id ? [i] : [])),
      variables: chain.variables.flatMap((v, i) => (isUpstream(v.stage) ? [i] : [])),
    });
  }
  return out;
}

export interface WorstCase {
  /** Per check (chain order): extremes over the tolerance box, NaN when never finite. */
  readonly min: Float64Array;
  readonly max: Float64Array;
  /** Per check: how its band was bound (the weaker of its two sides: search > monotone > corners). */
  readonly method: readonly BoundMethod[];
  readonly evaluations: number;
}

/** Coordinate steps of the pattern search after the vertex pass, as a fraction of the half-width. */
const patternSteps = [0.5, 0.25, 0.125] as const;
/** Points the search remembers (8 bytes per check and one per variable each) before it starts afresh. */
const maxRemembered = 20_000;
/** Passes over all variables at one step before giving up on further gains (a safety bound). */
const maxPasses = 6;

/**
 * Extremes of every check over the tolerance box, deterministic: the same plan
 * gives the same band whatever the Monte Carlo's trial count or seed.
 *
 * Checks are taken stage by stage. The variables that can move a stage's
 * checks are those of the stage, its upstream stages, the rails, the op-amp
 * and the temperature, less those whose sensitivity is zero for every check of
 * the stage. Up to `maxCornerVariables` of them, every corner of their box is
 * evaluated; beyond, each check starts from the corner its sensitivities point
 * to. Either way a coordinate search follows from each check's best point:
 * every variable is tried at its other end and at its middle, then at steps of
 * ½, ¼ and ⅛ of its half-width, keeping any move that goes further; a check
 * that moved is searched again from the nominal and from the best point any
 * other evaluation found for it (multi-start). Every evaluated point lies in
 * the box, so it widens every check it gives a value for, not only its own.
 */
export function worstCase(chain: Chain, perSigma: readonly Float64Array[], options: WorstCaseOptions = {}): WorstCase {
  const cornerLimit = options.maxCornerVariables ?? maxCornerVariables;
  const nCheck = chain.checks.length;
  const min = new Float64Array(nCheck).fill(Infinity);
  const max = new Float64Array(nCheck).fill(-Infinity);
  const method: BoundMethod[] = new Array<BoundMethod>(nCheck).fill('monotone');
  const out = new Float64Array(nCheck);
  const x = Float64Array.from(chain.nominal);
  const spread = Float64Array.from(chain.variables, (v) => spreadOf(v));
  const nominal = chain.nominal;
  let evaluations = 0;

  // Best point seen per check and side (u in [−1, 1] per variable), for the multi-start.
  const nVar = chain.variables.length;
  const bestU = { max: new Map<number, Float64Array>(), min: new Map<number, Float64Array>() };

  // Points already evaluated at a depth (checks of one stage often share their corners and
  // their neighbours): the values they gave, so the search reads them again without evaluating.
  // Keyed by a hash of (depth, u), each bucket a chain of points checked one by one, so a
  // collision costs a compare. The points live in flat arrays (8·u as small integers, the
  // values side by side), not an object and two arrays each: the search keeps thousands
  // alive, and the garbage collector copied every one of them (measured: a tenth of the search).
  const seen = new Map<number, number>();
  let capacity = 256;
  let pointU = new Int8Array(capacity * nVar);
  let pointOut = new Float64Array(capacity * nCheck);
  let pointDepth = new Float64Array(capacity);
  let pointNext = new Int32Array(capacity);
  let remembered = 0;
  const grow = (): void => {
    capacity = Math.min(maxRemembered, 2 * capacity);
    const u8 = new Int8Array(capacity * nVar);
    u8.set(pointU);
    pointU = u8;
    const o = new Float64Array(capacity * nCheck);
    o.set(pointOut);
    pointOut = o;
    const d = new Float64Array(capacity);
    d.set(pointDepth);
    pointDepth = d;
    const n = new Int32Array(capacity);
    n.set(pointNext);
    pointNext = n;
  };

  /** Evaluate the chain at u (first `depth` stages) and widen every check it gives; `out` holds the values. */
  const take = (u: Float64Array, depth: number): void => {
    // u holds multiples of 1/8 (ends, middles and the pattern steps): 8·u is a small integer.
    let h = Math.imul(depth + 1, 0x9e3779b1);
    for (let i = 0; i < nVar; i++) h = Math.imul(h ^ ((u[i] as number) * 8 + 16 + 33 * i), 0x01000193);
    for (let p = seen.get(h) ?? -1; p >= 0; p = pointNext[p] as number) {
      if (pointDepth[p] !== depth) continue;
      const at = p * nVar;
      let isSame = true;
      for (let i = 0; i < nVar && isSame; i++) isSame = pointU[at + i] === (u[i] as number) * 8;
      if (isSame) {
        const from = p * nCheck;
        for (let c = 0; c < nCheck; c++) out[c] = pointOut[from + c] as number;
        return;
      }
    }
    for (let i = 0; i < nVar; i++) x[i] = (nominal[i] as number) + (u[i] as number) * (spread[i] as number);
    chain.evaluate(x, out, depth);
    evaluations++;
    // Bounded: a large plan's search must not hold every point it ever visited.
    if (remembered >= maxRemembered) {
      seen.clear();
      remembered = 0;
    }
    if (remembered >= capacity) grow();
    const p = remembered++;
    for (let i = 0; i < nVar; i++) pointU[p * nVar + i] = (u[i] as number) * 8;
    pointOut.set(out, p * nCheck);
    pointDepth[p] = depth;
    pointNext[p] = seen.get(h) ?? -1;
    seen.set(h, p);
    // The point as a start for later searches, copied once if it is the best of any check.
    let kept: Float64Array | undefined;
    for (let c = 0; c < nCheck; c++) {
      const v = out[c] as number;
      if (!Number.isFinite(v)) continue;
      if (v > (max[c] as number)) {
        max[c] = v;
        kept ??= Float64Array.from(u);
        bestU.max.set(c, kept);
      }
      if (v < (min[c] as number)) {
        min[c] = v;
        kept ??= Float64Array.from(u);
        bestU.min.set(c, kept);
      }
    }
  };

  const u = new Float64Array(nVar);
  take(u, chain.checks.length > 0 ? Number.MAX_SAFE_INTEGER : 0);
  const nominalOut = Float64Array.from(out);

  for (const group of groups(chain, options.upstream)) {
    const depth = group.depth;
    const checks = group.checks.filter((c) => chain.checks[c]?.phase !== 'unpowered' && chain.checks[c]?.phase !== 'first-power');
    if (checks.length === 0) continue;
    // Sensitivities at the nominal say which variables matter; a check with no value there (a stage
    // that stops at the nominal but runs elsewhere in the box) has none to say it, so all may.
    const blind = checks.some((c) => !Number.isFinite(nominalOut[c] as number));
    const vars = group.variables.filter((i) => (spread[i] as number) > 0 && (blind || checks.some((c) => (perSigma[i]?.[c] ?? 0) !== 0)));
    const useCorners = vars.length <= cornerLimit;
    if (useCorners) {
      const corners = 2 ** vars.length;
      u.fill(0);
      for (let m = 0; m < corners; m++) {
        for (let k = 0; k < vars.length; k++) u[vars[k] as number] = Math.floor(m / 2 ** k) % 2 === 1 ? 1 : -1;
        take(u, depth);
      }
    }
    for (const c of checks) {
      let moved = false;
      for (const side of [1, -1] as const) {
        const start = (from: Float64Array | undefined): Float64Array => {
          const s = new Float64Array(nVar);
          if (from) for (const i of vars) s[i] = from[i] as number;
          return s;
        };
        // The sensitivity corner: each variable to the end that moves the check this way.
        const corner = new Float64Array(nVar);
        for (const i of vars) {
          const d = perSigma[i]?.[c] ?? 0;
          corner[i] = d === 0 ? 0 : Math.sign(d) * side;
        }
        if (!useCorners) take(corner, depth);
        const best = (side > 0 ? bestU.max : bestU.min).get(c);
        const first = useCorners ? start(best) : corner;
        const found = search(first, vars, depth, c, side);
        if (found !== 'none') moved = true;
        // Multi-start where the check has an inside optimum: from the nominal too. Then from the
        // best point any evaluation found for it (often another check's search).
        if (found === 'inside') search(new Float64Array(nVar), vars, depth, c, side);
        const again = (side > 0 ? bestU.max : bestU.min).get(c);
        if (found !== 'none' && again) search(start(again), vars, depth, c, side);
      }
      method[c] = moved ? 'search' : useCorners ? 'corners' : 'monotone';
    }
  }

  /**
   * Coordinate search for check c on one side from `point` (changed in place).
   * Returns `none` when no move went further than the start, `vertex` when only
   * moves from end to end did (a corner other than the sensitivities' one: a
   * kink such as the larger of two peaks), `inside` when a move to a variable's
   * middle did (an optimum inside the box: pattern steps follow).
   */
  function search(point: Float64Array, vars: readonly number[], depth: number, c: number, side: 1 | -1): 'none' | 'vertex' | 'inside' {
    const read = (): number => {
      const v = out[c] as number;
      return Number.isFinite(v) ? side * v : -Infinity;
    };
    take(point, depth);
    let here = read();
    let improved = false;
    let inside = false;
    const tryAt = (i: number, to: number): boolean => {
      const was = point[i] as number;
      if (to === was) return false;
      point[i] = to;
      take(point, depth);
      const now = read();
      // A gain below rounding noise is no gain (it would walk the search along flat ground).
      if (now > here + 1e-12 * Math.max(1, Math.abs(here))) {
        here = now;
        return true;
      }
      point[i] = was;
      return false;
    };
    // Vertex pass: every variable to its other end, and to its middle.
    for (let pass = 0; pass < maxPasses; pass++) {
      let gained = false;
      for (const i of vars) {
        const at = point[i] as number;
        const candidates = at === 0 ? [1, -1] : [-at, 0];
        for (const to of candidates) {
          if (tryAt(i, to)) {
            gained = true;
            if (to === 0) inside = true;
            break;
          }
        }
      }
      if (!gained) break;
      improved = true;
    }
    if (!improved) return 'none';
    if (!inside) return 'vertex';
    // Pattern steps: the optimum lies off the vertices, walk to it coordinate by coordinate.
    for (const h of patternSteps) {
      for (let pass = 0; pass < maxPasses; pass++) {
        let gained = false;
        for (const i of vars) {
          const at = point[i] as number;
          if (tryAt(i, Math.min(1, at + h)) || tryAt(i, Math.max(-1, at - h))) gained = true;
        }
        if (!gained) break;
      }
    }
    return 'inside';
  }

  for (let c = 0; c < nCheck; c++) {
    if (min[c] === Infinity) {
      min[c] = Number.NaN;
      max[c] = Number.NaN;
    }
  }
  return { min, max, method, evaluations };
}
