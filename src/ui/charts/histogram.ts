import type { Band } from '../../analysis/types.js';
import { histogramBins } from '../../review/histogram.js';
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
  /** Number of bins; by default about 2·√n, at most one per column. */
  readonly bins?: number;
}

const gutter = 6;

/** About 2·√n bins (common practice, no source), at least 5, at most one per column. */
export function defaultBins(n: number, columns: number): number {
  return Math.max(1, Math.min(columns, Math.max(5, Math.ceil(2 * Math.sqrt(n)))));
}

/**
 * A vertical histogram of readings with the worst-case band's edges marked
 * `[` and `]` and the nominal `N` on the line under the axis, each at the
 * column of its value, so the marks read without colour. Each bin is drawn
 * as one or more whole columns. Returns lines joined by `\n`.
 */
export function histogramChart(values: readonly number[], options: HistogramChartOptions = {}): string {
  const width = Math.max(gutter + 4, Math.floor(options.width ?? 60));
  const height = Math.max(1, Math.floor(options.height ?? 6));
  const room = width - gutter;
  const finiteCount = values.filter((v) => Number.isFinite(v)).length;
  const bins = Math.max(1, Math.min(room, Math.floor(options.bins ?? defaultBins(finiteCount, room))));
  const unit = options.unit ?? null;
  const show = (v: number) => (unit ? formatValue(v, unit) : String(Number(v.toPrecision(4))));
  const h = histogramBins(values, { bins, band: options.band ?? null, nominal: options.nominal ?? null });
  const n = h.counts.reduce((a, b) => a + b, 0);
  if (n === 0) return 'no readings to draw';
  const cols = Math.max(1, Math.floor(room / bins));
  const plotWidth = cols * bins;
  const top = Math.max(...h.counts);
  const lines: string[] = [];
  for (let row = height; row >= 1; row--) {
    const label = row === height ? String(top) : '';
    let bar = '';
    for (const c of h.counts) {
      // Each row is worth top/height boards; a half cell shows a count between rows, ▁ a count too small for a row.
      const level = (c / top) * height;
      const mark = level >= row ? '█' : level >= row - 0.5 && c > 0 ? '▄' : row === 1 && c > 0 ? '▁' : ' ';
      // A gap between wide bins keeps neighbours apart.
      bar += cols > 2 ? mark.repeat(cols - 1) + ' ' : mark.repeat(cols);
    }
    lines.push(`${label.padStart(gutter - 2)} │${bar}`);
  }
  lines.push(`${'0'.padStart(gutter - 2)} └${'─'.repeat(plotWidth)}`);
  const marks = new Array<string>(plotWidth).fill(' ');
  const column = (v: number) => Math.min(plotWidth - 1, Math.max(0, Math.floor(((v - h.lo) / (h.hi - h.lo)) * plotWidth)));
  const nominal = options.nominal ?? null;
  if (nominal !== null && Number.isFinite(nominal)) marks[column(nominal)] = 'N';
  // An open side of a one-sided band (±∞) has no edge to mark.
  if (options.band && Number.isFinite(options.band.min)) marks[column(options.band.min)] = '[';
  if (options.band && Number.isFinite(options.band.max)) marks[column(options.band.max)] = ']';
  lines.push(`${' '.repeat(gutter)}${marks.join('')}`);
  const lo = show(h.lo);
  const hi = show(h.hi);
  lines.push(`${' '.repeat(gutter)}${lo}${' '.repeat(Math.max(1, plotWidth - lo.length - hi.length))}${hi}`);
  const legend: string[] = [`${n} board${n === 1 ? '' : 's'} in ${bins} bins`];
  if (options.band) legend.push(`[ ] band ${show(options.band.min)} … ${show(options.band.max)}`);
  if (nominal !== null) legend.push(`N nominal ${show(nominal)}`);
  // The legend drops what does not fit rather than wrapping under the chart.
  let text = legend[0] ?? '';
  for (const part of legend.slice(1)) if (gutter + text.length + 3 + part.length <= width) text += `   ${part}`;
  lines.push(`${' '.repeat(gutter)}${text}`);
  return lines.join('\n');
}
