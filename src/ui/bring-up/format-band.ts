import { formatValue } from '../../units/format.js';
import type { Unit } from '../../units/unit.js';

/** A band as a technician reads it: `2.31 kHz … 2.71 kHz`, `≥ 100 Ω` when open above, `≤ 45 mA` when open below (the plan screen's, 4 digits). */
export { formatBand } from '../plan-screen/format-band.js';

/** A reading, with `OL` for an open circuit. */
export function formatReading(value: number, unit: Unit): string {
  if (value === Number.POSITIVE_INFINITY && unit === 'Ω') return 'OL (open)';
  return formatValue(value, unit);
}

/**
 * Where a reading sits in its band, as a small gauge 11 cells wide between the
 * band's ends: `[····●·····]`, with `◂` or `▸` outside it. Null for an open band.
 */
export function bandGauge(position: number): string | null {
  if (!Number.isFinite(position) && !Number.isNaN(position)) return position < 0 ? '◂[··········]' : '[··········]▸';
  if (Number.isNaN(position)) return null;
  if (position < 0) return '◂[··········]';
  if (position > 1) return '[··········]▸';
  const cells = Array.from('··········');
  const at = Math.min(9, Math.floor(position * 10));
  cells[at] = '●';
  return `[${cells.join('')}]`;
}
