/**
 * One period averaged over whole periods (synchronous averaging): each period
 * is resampled to `points` samples by linear interpolation, starting at
 * `start` (a fractional sample index), and the periods are summed. Noise
 * that is not locked to the signal falls as 1/√periods; harmonics stay.
 */
export function averagePeriod(x: Float64Array, start: number, period: number, periods: number, points: number): Float64Array {
  const out = new Float64Array(points);
  const last = x.length - 1;
  // The offsets within a period, computed once (the same values as inline).
  const offsets = new Float64Array(points);
  for (let j = 0; j < points; j++) offsets[j] = (j * period) / points;
  for (let p = 0; p < periods; p++) {
    const base = start + p * period;
    if (base >= 0 && base + period < last - 1) {
      // Wholly inside the record: no index needs clamping.
      for (let j = 0; j < points; j++) {
        const t = base + (offsets[j] as number);
        const i = Math.floor(t);
        const f = t - i;
        out[j] = (out[j] as number) + (x[i] as number) * (1 - f) + (x[i + 1] as number) * f;
      }
      continue;
    }
    for (let j = 0; j < points; j++) {
      const t = base + (offsets[j] as number);
      const i = Math.min(last - 1, Math.max(0, Math.floor(t)));
      const f = t - i;
      out[j] = (out[j] as number) + (x[i] as number) * (1 - f) + (x[i + 1] as number) * f;
    }
  }
  for (let j = 0; j < points; j++) out[j] = (out[j] as number) / periods;
  return out;
}
