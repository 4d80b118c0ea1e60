import type { Band } from '../analysis/types.js';
import type { Spread } from './stats.js';

/** Why capability indices could not be computed, or `ok`. */
export type CapabilityStatus = 'ok' | 'one-sided' | 'not-enough-data' | 'no-spread' | 'no-band';

export interface Capability {
  /** (USL − LSL) / 6σ; null unless status is `ok`. */
  readonly cp: number | null;
  /** min(USL − μ, μ − LSL) / 3σ; null unless status is `ok`. */
  readonly cpk: number | null;
  readonly status: CapabilityStatus;
  /** One line a technician can read, e.g. `not enough data: 1 reading`. */
  readonly note: string;
}

/** The words shown for each status. */
export const capabilityNote: Readonly<Record<CapabilityStatus, string>> = {
  ok: '',
  'one-sided': 'one-sided band: Cp needs both limits; Cpk is taken from the finite one',
  'not-enough-data': 'not enough data: Cp and Cpk need at least 2 readings',
  'no-spread': 'not enough data: every reading is the same, so the spread is zero',
  'no-band': 'no band: the plan snapshot for this check could not be read',
};

/**
 * Process capability against the worst-case band as the specification limits.
 * NIST/SEMATECH e-Handbook of Statistical Methods §6.1.6 (from memory):
 * Cp = (USL − LSL) / (6σ), Cpk = min(USL − μ, μ − LSL) / (3σ), with σ the
 * sample standard deviation. Fewer than two readings or zero spread give an
 * explicit status instead of NaN or Infinity.
 */
export function capabilityOf(spread: Spread, band: Band | null): Capability {
  const none = (status: CapabilityStatus): Capability => ({ cp: null, cpk: null, status, note: capabilityNote[status] });
  if (spread.n < 2 || spread.mean === null || spread.sd === null) {
    const c = none('not-enough-data');
    return { ...c, note: `not enough data: ${spread.n} reading${spread.n === 1 ? '' : 's'}, Cp and Cpk need at least 2` };
  }
  const hasMin = band !== null && Number.isFinite(band.min);
  const hasMax = band !== null && Number.isFinite(band.max);
  if (!band || (!hasMin && !hasMax)) return none('no-band');
  // A spread below 1e-12 of the value is the same reading typed again, not a process.
  const scale = Math.max(Math.abs(spread.mean), hasMax ? Math.abs(band.max) : 0, hasMin ? Math.abs(band.min) : 0, Number.MIN_VALUE);
  if (!(spread.sd > scale * 1e-12)) return none('no-spread');
  const sigma = spread.sd;
  // One-sided limits (an idle-current ceiling, a rail-to-ground floor): the
  // handbook's Cpu = (USL − μ)/3σ or Cpl = (μ − LSL)/3σ stands for Cpk, and Cp is undefined.
  const upper = hasMax ? (band.max - spread.mean) / (3 * sigma) : Infinity;
  const lower = hasMin ? (spread.mean - band.min) / (3 * sigma) : Infinity;
  const cpk = Math.min(upper, lower);
  if (!hasMin || !hasMax) return { cp: null, cpk, status: 'one-sided', note: capabilityNote['one-sided'] };
  const cp = (band.max - band.min) / (6 * sigma);
  return { cp, cpk, status: 'ok', note: '' };
}
