import table from '../../data/e-series.json' with { type: 'json' };

/** The preferred number series of IEC 60063:2015. */
export type SeriesName = 'E3' | 'E6' | 'E12' | 'E24' | 'E48' | 'E96' | 'E192';

/** The mantissas (1 ≤ m < 10) of a series, ascending. */
export function seriesValues(name: SeriesName): readonly number[] {
  return table.series[name];
}

/** A standard value near a given one, with its neighbours in the same series. */
export interface StandardValue {
  readonly series: SeriesName;
  /** The nearest standard value (ratio distance, since the series are geometric). */
  readonly nearest: number;
  /** The standard values just below and above the nearest one. */
  readonly below: number;
  readonly above: number;
  /** (value − nearest) / nearest. */
  readonly error: number;
}

/** Standard values of a series across decades, around `value`. */
function decadeValues(name: SeriesName, decade: number): number[] {
  const scale = 10 ** decade;
  // Rounded so that 4.7 × 1e3 prints as 4700, not 4700.000000000001.
  return table.series[name].map((m) => Number((m * scale).toPrecision(4)));
}

/** The nearest standard value of `series` to `value` (> 0), with neighbours. */
export function nearestStandard(value: number, series: SeriesName = 'E24'): StandardValue {
  if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`nearestStandard needs a positive finite value, got ${value}`);
  const decade = Math.floor(Math.log10(value));
  const candidates = [...decadeValues(series, decade - 1), ...decadeValues(series, decade), ...decadeValues(series, decade + 1)];
  let best = 0;
  for (let i = 1; i < candidates.length; i++) {
    const c = candidates[i] ?? 0;
    const b = candidates[best] ?? 0;
    if (Math.abs(Math.log(value / c)) < Math.abs(Math.log(value / b))) best = i;
  }
  const nearest = candidates[best] ?? value;
  return {
    series,
    nearest,
    below: candidates[best - 1] ?? nearest,
    above: candidates[best + 1] ?? nearest,
    error: (value - nearest) / nearest,
  };
}

/** Whether `value` is a standard value of `series` (within 0.1 %). */
export function isStandard(value: number, series: SeriesName = 'E24'): boolean {
  return value > 0 && Math.abs(nearestStandard(value, series).error) < 1e-3;
}
