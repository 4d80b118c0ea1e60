import type { Band, Contributor, Target } from '../../analysis/types.js';
import { partWithRef } from '../../plan/refs.js';
import { formatValue } from '../../units/format.js';
import type { Unit } from '../../units/unit.js';

/** `2.143 kHz … 2.611 kHz`, `≥ 100 Ω` or `≤ 45 mA` for one-sided bands. */
export function formatBand(band: Band, unit: Unit, digits = 4): string {
  const lo = Number.isFinite(band.min);
  const hi = Number.isFinite(band.max);
  if (lo && hi) return `${formatValue(band.min, unit, { digits })} … ${formatValue(band.max, unit, { digits })}`;
  if (lo) return `≥ ${formatValue(band.min, unit, { digits })}`;
  if (hi) return `≤ ${formatValue(band.max, unit, { digits })}`;
  return 'any value';
}

/** The largest contributor as `osc.Ct 62%` (`osc.Ct (C7) 62%` when the plan names its designator), or `—`. */
export function formatContributor(c: Contributor | undefined, refs: ReadonlyMap<string, string> = noRefs): string {
  if (!c) return '—';
  return `${partWithRef(c.part, refs)} ${Math.round(c.share * 100)}%`;
}

const noRefs: ReadonlyMap<string, string> = new Map();

/** The nominal, or for one-sided limits (no expected value) a dash. */
export function formatNominal(t: Pick<Target, 'nominal' | 'unit' | 'phase' | 'worst'>): string {
  if (t.phase === 'unpowered' || (t.phase === 'first-power' && Number.isFinite(t.worst.max) && t.worst.min === 0)) return '—';
  return formatValue(t.nominal, t.unit);
}

/** Words for the bring-up phases. */
export const phaseWord: Readonly<Record<Target['phase'], string>> = {
  unpowered: 'unpowered',
  'first-power': 'first power',
  rails: 'rails',
  stage: 'stage',
};
