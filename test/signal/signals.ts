// Test signals: ideal shapes sampled at a non-integer number of samples per period.
export type Shape = (phase: number) => number;

export const sine: Shape = (p) => Math.sin(2 * Math.PI * p);
export const square: Shape = (p) => (p < 0.5 ? 1 : -1);
export const triangle: Shape = (p) => (p < 0.25 ? 4 * p : p < 0.75 ? 2 - 4 * p : 4 * p - 4);

/** A seeded normal generator (Park–Miller and Box–Muller), so failures repeat. */
export function gaussian(seed: number): () => number {
  let s = seed % 2147483647 || 1;
  const next = (): number => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return () => Math.sqrt(-2 * Math.log(next())) * Math.cos(2 * Math.PI * next());
}

/** `n` samples of `shape` with `period` samples per period (fractional), peak `peak`, offset and noise σ. */
export function sampled(
  shape: Shape,
  n: number,
  period: number,
  options: { peak?: number; offset?: number; noise?: number; phase?: number; seed?: number } = {},
): Float64Array {
  const { peak = 1, offset = 0, noise = 0, phase = 0.123, seed = 7 } = options;
  const g = gaussian(seed);
  return Float64Array.from({ length: n }, (_, i) => {
    const p = (((i / period + phase) % 1) + 1) % 1;
    return offset + peak * shape(p) + (noise > 0 ? noise * g() : 0);
  });
}
