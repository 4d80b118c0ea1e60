/**
 * A small seeded generator, so the same seed gives the same bands on every
 * machine and Node version (Math.random cannot be seeded).
 *
 * xoshiro128** (Blackman and Vigna, 2018; 32-bit state words, period 2^128 − 1),
 * its four state words filled from the seed by splitmix32, the seeding the same
 * authors recommend. Written from memory of the published reference code; the
 * tests check xoshiro128** against its reference outputs for the state {1, 2, 3, 4}
 * and the statistics (mean, spread, repeatability).
 */
export interface Random {
  /** Uniform in [0, 1). */
  next(): number;
  /** Standard normal. */
  normal(): number;
}

function splitmix32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/**
 * xoshiro128** from four 32-bit state words (not all zero): each call returns the
 * next output as an unsigned 32-bit integer.
 */
export function xoshiro128StarStar(state: readonly [number, number, number, number]): () => number {
  // The state in a typed array: closure variables holding 32-bit words above 2^31 were boxed
  // numbers, so every draw allocated (measured). The same arithmetic on the same bits.
  const w = Uint32Array.from(state, (x) => x >>> 0);
  if (((w[0] as number) | (w[1] as number) | (w[2] as number) | (w[3] as number)) === 0)
    throw new RangeError('xoshiro128** needs a state that is not all zero');
  return (): number => {
    const a = w[0] as number;
    const b = w[1] as number;
    const result = Math.imul(rotl(Math.imul(b, 5), 7), 9) >>> 0;
    const t = b << 9;
    const c = (w[2] as number) ^ a;
    const d = (w[3] as number) ^ b;
    const b2 = b ^ c;
    const a2 = a ^ d;
    w[0] = a2;
    w[1] = b2;
    w[2] = c ^ t;
    w[3] = rotl(d, 11);
    return result;
  };
}

export function createRandom(seed: number): Random {
  const init = splitmix32(seed);
  const state: [number, number, number, number] = [init(), init(), init(), init()];
  if ((state[0] | state[1] | state[2] | state[3]) === 0) state[0] = 1;
  const nextU32 = xoshiro128StarStar(state);
  const next = (): number => nextU32() / 4294967296;
  // The spare normal of the polar method in a typed array, for the same reason as the state.
  const spare = new Float64Array(1).fill(Number.NaN);
  return {
    next,
    // Marsaglia's polar method: two normals per accepted pair, the second kept.
    normal() {
      const kept = spare[0] as number;
      if (!Number.isNaN(kept)) {
        spare[0] = Number.NaN;
        return kept;
      }
      for (;;) {
        const u = 2 * next() - 1;
        const v = 2 * next() - 1;
        const s = u * u + v * v;
        if (s > 0 && s < 1) {
          const m = Math.sqrt((-2 * Math.log(s)) / s);
          spare[0] = v * m;
          return u * m;
        }
      }
    },
  };
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

/** How a part's value spreads within its tolerance. */
export type Distribution = 'normal' | 'uniform';

/**
 * One part's deviation as a fraction of its tolerance, in [−1, 1]. `normal`:
 * tolerance = 3σ, truncated at the limits by redrawing (a part outside its
 * tolerance is a defect, not spread — common practice, no source); `uniform`:
 * flat across the tolerance.
 */
export function drawDeviation(random: Random, distribution: Distribution): number {
  if (distribution === 'uniform') return 2 * random.next() - 1;
  for (;;) {
    const z = random.normal();
    if (z >= -3 && z <= 3) return z / 3;
  }
}
