import { formatPrefixes } from './prefix.js';
import type { Unit } from './unit.js';

export interface FormatOptions {
  /** Significant digits. @default 4 */
  readonly digits?: number;
  /** Keep trailing zeros (`4.700 k`), for aligned tables. @default false */
  readonly keepZeros?: boolean;
}

/**
 * A value in engineering notation with an SI prefix (`4.7 kΩ`, `-11.95 V`,
 * `1.024 kHz`). Fractions (unit `1`) are shown as percentages, gains plain.
 */
export function formatValue(value: number, unit: Unit, options: FormatOptions = {}): string {
  const { digits = 4, keepZeros = false } = options;
  if (!Number.isFinite(value)) return Number.isNaN(value) ? '—' : value > 0 ? '+∞' : '−∞';
  if (unit === '1') return `${trim((value * 100).toPrecision(digits), keepZeros)} %`;
  if (unit === 'V/V') return `${trim(value.toPrecision(digits), keepZeros)} V/V`;
  // Temperatures are kept in kelvin and read at the bench in degrees Celsius (0 °C = 273.15 K, SI Brochure).
  if (unit === 'K') return `${trim((value - 273.15).toPrecision(digits), keepZeros)} °C`;
  if (unit === 'V/s') {
    // Slew rates read naturally per microsecond.
    return `${trim((value / 1e6).toPrecision(digits), keepZeros)} V/µs`;
  }
  return `${formatNumber(value, digits, keepZeros)}${unit}`;
}

/** A number with an SI prefix and a trailing space before the unit symbol (`4.7 k`). */
export function formatNumber(value: number, digits = 4, keepZeros = false): string {
  if (value === 0) return `0 `;
  const exponent = Math.floor(Math.log10(Math.abs(value)) / 3) * 3;
  const clamped = Math.max(-15, Math.min(12, exponent));
  let mantissa = value / 10 ** clamped;
  let power = clamped;
  // Rounding can carry into the next power (999.96 → 1000).
  if (Math.abs(Number(mantissa.toPrecision(digits))) >= 1000 && power < 12) {
    power += 3;
    mantissa = value / 10 ** power;
  }
  const prefix = formatPrefixes.find(([p]) => p === power)?.[1] ?? '';
  return `${trim(mantissa.toPrecision(digits), keepZeros)} ${prefix}`;
}

function trim(text: string, keepZeros: boolean): string {
  if (keepZeros || !text.includes('.') || text.includes('e')) return text;
  return text.replace(/\.?0+$/, '');
}

/** A fraction as a signed percentage, e.g. `+2.3 %` for a deviation from nominal. */
export function formatPercent(fraction: number, digits = 3): string {
  if (!Number.isFinite(fraction)) return '—';
  const sign = fraction > 0 ? '+' : fraction < 0 ? '−' : '±';
  return `${sign}${trim(Math.abs(fraction * 100).toPrecision(digits), false)} %`;
}
