import { plot } from 'asciichart';
import { formatNumber } from '../../units/format.js';

/** Limits drawn as dashed lines: fixed levels or one value per sample of the expected trace. */
export interface TraceBand {
  readonly min: number | Float64Array;
  readonly max: number | Float64Array;
}

export interface TraceChartOptions {
  /** Total width in terminal columns, labels included. */
  readonly width: number;
  /** Total height in lines, the legend line included. */
  readonly height: number;
  /** Tolerance limits around the expected trace. */
  readonly band?: TraceBand;
  /** Unit for the axis labels. @default 'V' */
  readonly unit?: string;
  /** Print the legend line under the chart. @default true */
  readonly legend?: boolean;
}

/** Lowest and highest value of each column, so that a one-sample spike still shows. */
export interface Envelope {
  readonly min: Float64Array;
  readonly max: Float64Array;
}

/**
 * Decimate `samples` to `columns` columns keeping each column's minimum and
 * maximum. With fewer samples than columns, each column takes the nearest sample.
 */
export function minMaxColumns(samples: Float64Array, columns: number): Envelope {
  const min = new Float64Array(columns);
  const max = new Float64Array(columns);
  const n = samples.length;
  for (let c = 0; c < columns; c++) {
    let from = Math.floor((c * n) / columns);
    let to = Math.floor(((c + 1) * n) / columns);
    if (to <= from) to = from + 1;
    if (from >= n) from = n - 1;
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = from; i < to && i < n; i++) {
      const v = samples[i] ?? 0;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    min[c] = lo;
    max[c] = hi;
  }
  return { min, max };
}

const labelWidth = 8;
// asciichart puts the label in the first cell, then a space and the axis.
const prefixWidth = labelWidth + 2;
// The axis only: every line symbol blank, the traces are painted over it.
const axisOnly: [string, string, string, string, string, string, string, string, string, string] = ['┼', '┤', ' ', ' ', ' ', ' ', ' ', ' ', ' ', ' '];

interface Layer {
  readonly envelope: Envelope;
  /** Symbol where the column spans one row, and where it spans several. */
  readonly flat: string;
  readonly steep: string;
}

/**
 * An ASCII trace of the expected waveform (dotted), its band (dashed) and the
 * captured one (solid, drawn on top). Both traces span the full width: pass
 * arrays that cover the same time (e.g. the same number of periods). Long
 * captures are decimated with min/max per column so peaks survive.
 */
export function traceChart(expected: Float64Array | null, captured: Float64Array | null, options: TraceChartOptions): string {
  const { unit = 'V', legend = true, band } = options;
  const rows = Math.max(2, Math.floor(options.height) - (legend ? 1 : 0));
  const columns = Math.max(2, Math.floor(options.width) - prefixWidth);
  const layers: Layer[] = [];
  const levelSeries = (limit: number | Float64Array): Float64Array => (typeof limit === 'number' ? new Float64Array(columns).fill(limit) : limit);
  if (band) {
    layers.push({ envelope: minMaxColumns(levelSeries(band.min), columns), flat: '┄', steep: '┆' });
    layers.push({ envelope: minMaxColumns(levelSeries(band.max), columns), flat: '┄', steep: '┆' });
  }
  if (expected && expected.length > 0) layers.push({ envelope: minMaxColumns(expected, columns), flat: '·', steep: '·' });
  if (captured && captured.length > 0) layers.push({ envelope: minMaxColumns(captured, columns), flat: '─', steep: '│' });
  if (layers.length === 0) return 'no trace to draw';

  let lo = Infinity;
  let hi = -Infinity;
  for (const { envelope } of layers) {
    for (const v of envelope.min) if (Number.isFinite(v) && v < lo) lo = v;
    for (const v of envelope.max) if (Number.isFinite(v) && v > hi) hi = v;
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return 'no finite values to draw';
  if (hi - lo < 1e-12 * Math.max(1, Math.abs(hi))) {
    const pad = Math.abs(hi) > 0 ? Math.abs(hi) * 0.1 : 1;
    lo -= pad;
    hi += pad;
  }
  // Scale to whole rows ourselves, so the chart has exactly `rows` lines.
  const top = rows - 1;
  const toRow = (v: number): number => Math.round(((v - lo) / (hi - lo)) * top);
  const format = (x: number): string => {
    const value = lo + (x / top) * (hi - lo);
    return `${formatNumber(value, 3)}${unit}`.padStart(labelWidth).slice(-labelWidth);
  };
  const axis = plot([new Array<number>(columns + 1).fill(0)], {
    min: 0,
    max: top,
    height: top,
    offset: 3,
    padding: ' '.repeat(labelWidth),
    symbols: axisOnly,
    format,
  });
  const grid = axis.split('\n').map((line) => Array.from(line.padEnd(prefixWidth + columns)));
  for (const layer of layers) paint(grid, layer, toRow, top);
  const lines = grid.map((line) => line.join('').trimEnd());
  if (legend) {
    const parts: string[] = [];
    if (captured && captured.length > 0) parts.push('─ captured');
    if (expected && expected.length > 0) parts.push('· expected');
    if (band) parts.push('┄ band');
    lines.push(`${' '.repeat(prefixWidth)}${parts.join('   ')}`);
  }
  return lines.join('\n');
}

/** Fill each column from its lowest to its highest row, joined to the column before. */
function paint(grid: string[][], layer: Layer, toRow: (v: number) => number, top: number): void {
  const { min, max } = layer.envelope;
  let previous: { lo: number; hi: number } | undefined;
  for (let c = 0; c < min.length; c++) {
    const a = min[c] ?? Number.NaN;
    const b = max[c] ?? Number.NaN;
    if (!Number.isFinite(a) || !Number.isFinite(b)) {
      previous = undefined;
      continue;
    }
    let lo = toRow(a);
    let hi = toRow(b);
    const span = { lo, hi };
    // Join a jump from the column before, so a steep edge stays one line.
    if (previous && previous.hi < lo) lo = previous.hi + 1;
    if (previous && previous.lo > hi) hi = previous.lo - 1;
    previous = span;
    const symbol = hi > lo ? layer.steep : layer.flat;
    for (let r = Math.max(0, lo); r <= Math.min(top, hi); r++) {
      const line = grid[top - r];
      if (line) line[prefixWidth + c] = symbol;
    }
  }
}
