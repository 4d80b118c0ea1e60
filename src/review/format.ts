import { formatValue } from '../units/format.js';
import type { Unit } from '../units/unit.js';

/** A measured figure for a table; `—` when there is none. */
export function formatFigure(value: number | null, unit: Unit | null, digits = 4): string {
  if (value === null || !Number.isFinite(value)) return '—';
  return unit ? formatValue(value, unit, { digits }) : String(Number(value.toPrecision(digits)));
}

/** A capability index to two decimals, or `—`. */
export function formatIndex(value: number | null): string {
  return value === null || !Number.isFinite(value) ? '—' : value.toFixed(2);
}

/** A yield (fraction) as a whole-ish percentage, or `—`. */
export function formatPercent(value: number | null): string {
  if (value === null || !Number.isFinite(value)) return '—';
  const p = value * 100;
  return `${p === 100 || p === 0 ? p.toFixed(0) : p.toFixed(1)} %`;
}

/**
 * A word beside Cpk so the table never relies on colour. Cpk ≥ 1.33 is the
 * usual target for an established process, below 1 the band is being missed
 * (common practice, no source).
 */
export function cpkWord(cpk: number | null): string {
  if (cpk === null) return 'n/a';
  if (cpk >= 1.33) return 'capable';
  if (cpk >= 1) return 'tight';
  return 'not capable';
}

/** Pad or cut a table cell to a width (left-aligned). */
export function padCell(text: string, width: number): string {
  const chars = [...text];
  return chars.length > width ? `${chars.slice(0, Math.max(0, width - 1)).join('')}…` : text + ' '.repeat(width - chars.length);
}

/** Pad a table cell to a width, right-aligned. */
export function padCellRight(text: string, width: number): string {
  const chars = [...text];
  return chars.length >= width ? chars.slice(0, width).join('') : ' '.repeat(width - chars.length) + text;
}
