import type { Band } from '../../analysis/types.js';
import { binOf, histogramBins } from '../../review/histogram.js';
import { formatValue } from '../../units/format.js';
import type { Unit } from '../../units/unit.js';

export interface HistogramChartOptions {
  /** Total width in columns, labels included. @default 60 */
  readonly width?: number;
  /** Rows for the bars. @default 6 */
  readonly height?: number;
  readonly band?: Band | null;
  readonly nominal?: number | null;
  readonly unit?: Unit | null;
}

const gutter = 6;

/**
 * A vertical histogram of readings, one column per bin, with the worst-case
 * band's edges marked `[` and `]` and the nominal `N` on the line under the
 * axis, so the marks read without colour. Returns lines joined by `\n`.
 */
export function histogramChart(values: readonly number[], options: HistogramChartOptions = {}): string {
  const width = Math.max(gutter + 4, Math.floor(options.width ?? 60));
  const height = Math.max(1, Math.floor(options.height ?? 6));
  const bins = width - gutter;
  const unit = options.unit ?? null;
  const show = (v: number) => (unit ? formatValue(v, unit) : String(Number(v.toPrecision(4))));
  const h = histogramBins(values, { bins, band: options.band ?? null, nominal: options.nominal ?? null });
  const n = h.counts.reduce((a, b) => a + b, 0);
  if (n === 0) return 'no readings to draw';
  const top = Math.max(...h.counts);
  const lines: string[] = [];
  for (let row = height; row >= 1; row--) {
    const label = row === height ? String(top) : row === 1 && height > 1 ? '' : '';
    let bar = '';
    for (const c of h.counts) {
      // Each row is worth top/height boards; a half-filled cell shows a count between rows.
      const level = (c / top) * height;
      bar += level >= row ? '█' : level >= row - 0.5 && c > 0 ? '▄' : row === 1 && c > 0 ? '▁' : ' ';
    }
    lines.push(`${label.padStart(gutter - 2)} │${bar}`);
  }
  lines.push(`${'0'.padStart(gutter - 2)} └${'─'.repeat(bins)}`);
  const marks = new Array<string>(bins).fill(' ');
  const nominal = options.nominal ?? null;
  if (nominal !== null && Number.isFinite(nominal)) marks[binOf(h, nominal)] = 'N';
  // An open side of a one-sided band (±∞) has no edge to mark.
  if (options.band && Number.isFinite(options.band.min)) marks[binOf(h, options.band.min)] = '[';
  if (options.band && Number.isFinite(options.band.max)) marks[binOf(h, options.band.max)] = ']';
  lines.push(`${' '.repeat(gutter)}${marks.join('')}`);
  const lo = show(h.lo);
  const hi = show(h.hi);
  const span = Math.max(1, bins - lo.length - hi.length);
  lines.push(`${' '.repeat(gutter)}${lo}${' '.repeat(span)}${hi}`);
  const legend: string[] = [`${n} board${n === 1 ? '' : 's'}`];
  if (options.band) legend.push(`[ ] band ${show(options.band.min)} … ${show(options.band.max)}`);
  if (options.nominal !== undefined && options.nominal !== null) legend.push(`N nominal ${show(options.nominal)}`);
  lines.push(`${' '.repeat(gutter)}${legend.join('   ')}`);
  return lines.join('\n');
}
