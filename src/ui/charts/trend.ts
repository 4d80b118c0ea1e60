import { plot } from 'asciichart';
import type { Band } from '../../analysis/types.js';
import { formatValue } from '../../units/format.js';
import type { Unit } from '../../units/unit.js';

export interface TrendChartOptions {
  /** Rows of the plot. @default 6 */
  readonly height?: number;
  readonly band?: Band | null;
  readonly nominal?: number | null;
  readonly unit?: Unit | null;
  /** Label column width. @default 11 */
  readonly labelWidth?: number;
}

/**
 * The latest readings in time order as an asciichart line, with the band's
 * edges as flat lines so a drift towards an edge shows without colour. The
 * caller thins the series to the width it has (review/trend `trendOf`).
 */
export function trendChart(values: readonly number[], options: TrendChartOptions = {}): string {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return 'no readings to draw';
  if (finite.length === 1) return 'one reading: a trend needs at least two';
  const unit = options.unit ?? null;
  const labelWidth = options.labelWidth ?? 11;
  // Only finite band edges are drawn: an open side (±∞) has no line.
  const bandMin = options.band && Number.isFinite(options.band.min) ? options.band.min : null;
  const bandMax = options.band && Number.isFinite(options.band.max) ? options.band.max : null;
  let min = Math.min(...finite);
  let max = Math.max(...finite);
  if (bandMin !== null) min = Math.min(min, bandMin);
  if (bandMax !== null) max = Math.max(max, bandMax);
  if (min === max) {
    const half = min === 0 ? 1 : Math.abs(min) * 0.01;
    min -= half;
    max += half;
  }
  const series: number[][] = [finite];
  if (bandMax !== null) series.push(finite.map(() => bandMax));
  if (bandMin !== null) series.push(finite.map(() => bandMin));
  const hasBand = bandMin !== null || bandMax !== null;
  const chart = plot(series, {
    height: Math.max(2, Math.floor(options.height ?? 6)),
    min,
    max,
    format: (raw: number) => {
      // asciichart's label arithmetic leaves 1e-18 where 0 is meant; snap it.
      const x = Math.abs(raw) < (max - min) * 1e-9 ? 0 : raw;
      return (unit ? formatValue(x, unit, { digits: 4 }) : String(Number(x.toPrecision(4)))).padStart(labelWidth);
    },
  });
  const legend = hasBand ? `oldest → newest, ${finite.length} points; flat lines: band edges` : `oldest → newest, ${finite.length} points`;
  return `${chart}\n${' '.repeat(labelWidth + 2)}${legend}`;
}
