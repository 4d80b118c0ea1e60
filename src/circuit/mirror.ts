/**
 * Many waveforms in a chain mirror about their peak (a triangle, a sine, a shaped
 * triangle): sample p+j equals sample p−j. A memoryless stage then needs solving
 * only from the trough up to the peak and copying the rest — exact, since equal
 * inputs give equal outputs. `order` lists the samples to solve, in walking order
 * (one slope, so a warm-started solver moves in small steps); `fill` copies the
 * solved half to the mirrored half. When the waveform does not mirror, `order`
 * walks every sample from the peak on and `fill` does nothing.
 */
export interface MirrorPlan {
  readonly order: Int32Array;
  fill(out: Float64Array): void;
}

/** Mirror samples must agree this closely (relative to the peak-to-peak) to count as equal. */
const sameLevel = 1e-12;

export function mirrorOrder(samples: Float64Array): MirrorPlan {
  const n = samples.length;
  let p = 0;
  let top = n > 0 ? (samples[0] as number) : 0;
  let lo = Infinity;
  for (let i = 0; i < n; i++) {
    const v = samples[i] as number;
    if (v > top) {
      top = v;
      p = i;
    }
    if (v < lo) lo = v;
  }
  const span = top - lo;
  const half = Math.floor(n / 2);
  let mirrored = n >= 4;
  const allowed = sameLevel * span;
  // Walk both ways from the peak with wrapping indices (no modulo in the loop: it runs every trial).
  let up = p;
  let down = p;
  for (let j = 1; j <= half && mirrored; j++) {
    up = up + 1 === n ? 0 : up + 1;
    down = down === 0 ? n - 1 : down - 1;
    const d = (samples[up] as number) - (samples[down] as number);
    if (d > allowed || d < -allowed) mirrored = false;
  }
  if (!mirrored) {
    if (last && !last.mirrored && last.n === n && last.p === p) return last.plan;
    const order = new Int32Array(n);
    for (let j = 0; j < n; j++) order[j] = (p + j) % n;
    const plan = { order, fill: () => undefined };
    last = { n, p, mirrored: false, plan };
    return plan;
  }
  if (last && last.mirrored && last.n === n && last.p === p) return last.plan;
  // From the sample opposite the peak up to the peak: one slope.
  const order = new Int32Array(half + 1);
  for (let j = 0; j <= half; j++) order[j] = (p - half + j + n) % n;
  const plan: MirrorPlan = {
    order,
    fill(out) {
      let up = p;
      let down = p;
      for (let j = 1; j < n - half; j++) {
        up = up + 1 === n ? 0 : up + 1;
        down = down === 0 ? n - 1 : down - 1;
        out[up] = out[down] as number;
      }
    },
  };
  last = { n, p, mirrored: true, plan };
  return plan;
}

/** The last plan made: in a Monte Carlo every trial's triangle has its peak at the same sample. */
let last: { readonly n: number; readonly p: number; readonly mirrored: boolean; readonly plan: MirrorPlan } | undefined;
