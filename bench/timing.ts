// What the in-process benchmarks time with: this process's CPU time (user +
// system, process.cpuUsage), not wall time, because on a shared, loaded machine
// wall time mostly measures the other jobs; and the median of the rounds.

/** The median (the mean of the two middle values for an even count); NaN for none. */
export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  if (s.length === 0) return Number.NaN;
  return s.length % 2 ? (s[m] as number) : ((s[m - 1] as number) + (s[m] as number)) / 2;
}

/** CPU time of one call of `f`, ms. */
export function cpuMs(f: () => void): number {
  const t0 = process.cpuUsage();
  f();
  const d = process.cpuUsage(t0);
  return (d.user + d.system) / 1000;
}

/** CPU time per call of `f` over `n` calls after `warmup` untimed ones, µs. */
export function cpuPerCall(n: number, f: () => void, warmup = Math.min(500, n)): number {
  for (let i = 0; i < warmup; i++) f();
  const t0 = process.cpuUsage();
  for (let i = 0; i < n; i++) f();
  const d = process.cpuUsage(t0);
  return (d.user + d.system) / n;
}
