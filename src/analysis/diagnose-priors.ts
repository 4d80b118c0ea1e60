import type { FaultMode } from '../circuit/types.js';
import type { ChainVariable } from '../plan/chain.js';
import { nearestStandard, type SeriesName } from '../units/e-series.js';

/**
 * Priors of the single-fault hypotheses: how often each kind of fault is the
 * cause on a freshly assembled board, per part. These are judgement from bench
 * practice (common practice, no source), relative to each other; only their
 * ratios matter, because the scores are normalised over the kept hypotheses.
 *
 * - A wrong value from the kit is the commonest fault: the neighbouring bin of
 *   the same series (a 15k for an 18k) or a decade slip — 2 % each; 2.5 % for
 *   a capacitor's decade slip, whose three-digit code (223 for 22n, 224 for
 *   220n) differs in a digit that is easily misread, where a resistor's decade
 *   is a whole colour band.
 * - A polarised part fitted backwards (a diode, one zener of a pair): 2 %.
 * - Another standard value from the wrong reel: 0.5 %; a two-decade slip 0.4 %.
 * - A part not fitted: 0.5 %; a dry joint or cracked part (open): 0.3 %; a
 *   solder bridge across a part (short): 0.2 %.
 * - A value off every standard (a damaged or drifted part) is rare and rarer the
 *   further it is: 0.1 % at the edge of tolerance, falling by e for every
 *   factor of 3 (a resistor at 3× its value: about 0.04 %).
 * - A rail off nominal (bench supply set wrong, a regulator's set resistor):
 *   1 % near nominal, falling by e for every 35 % of the rail.
 */
export type ValueClass = 'neighbour' | 'decade' | 'standard' | 'decade2' | 'off-standard' | 'rail';

export const modePrior: Readonly<Record<Exclude<FaultMode, 'value'>, number>> = {
  reversed: 0.02,
  missing: 0.005,
  open: 0.003,
  short: 0.002,
};

const classPrior: Readonly<Record<Exclude<ValueClass, 'off-standard' | 'rail'>, number>> = {
  neighbour: 0.02,
  decade: 0.02,
  standard: 0.005,
  decade2: 0.004,
};

/** The prior of a wrong value `ratio` × the fitted one, by its class. */
export function valuePrior(cls: ValueClass, ratio: number, unit?: string): number {
  const far = Math.abs(Math.log(ratio));
  if (cls === 'decade' && unit === 'F') return 0.025;
  if (cls === 'rail') return 0.01 * Math.exp(-far / 0.3);
  if (cls === 'off-standard') return 0.001 * Math.exp(-far / Math.log(3));
  return classPrior[cls];
}

/**
 * The series a part's values come from, when it comes in preferred values:
 * resistors E24, capacitors E12 (their common stock series), zener voltages
 * E24 (small zeners are sold in E24 steps; from memory). IEC 60063:2015.
 */
export function seriesOf(v: ChainVariable): SeriesName | undefined {
  if (v.unit === 'Ω') return 'E24';
  if (v.unit === 'F' || v.unit === 'H') return 'E12';
  if (v.unit === 'V' && /(^|\.)vz2?$/.test(v.role)) return 'E24';
  return undefined;
}

/** A wrong value to try, with its class. */
export interface ValueCandidate {
  readonly value: number;
  readonly cls: ValueClass;
}

/** The discrete wrong values of a part: decade slips and the series neighbours of the fitted value. */
export function discreteCandidates(v: ChainVariable): ValueCandidate[] {
  const series = seriesOf(v);
  if (!series || !(v.nominal > 0)) return [];
  const list: ValueCandidate[] = [];
  if (v.unit !== 'V') {
    list.push(
      { value: v.nominal * 10, cls: 'decade' },
      { value: v.nominal / 10, cls: 'decade' },
      { value: v.nominal * 100, cls: 'decade2' },
      { value: v.nominal / 100, cls: 'decade2' },
    );
  }
  const near = nearestStandard(v.nominal, series);
  for (const x of [near.below, near.above]) if (x !== near.nearest) list.push({ value: x, cls: 'neighbour' });
  return list;
}

/** The class of a value the continuous solve found, snapped to the part's series when one is close. */
export function classify(v: ChainVariable, value: number): ValueCandidate {
  if (v.stage === 'rails') return { value, cls: 'rail' };
  const series = seriesOf(v);
  if (!series || !(value > 0)) return { value, cls: 'off-standard' };
  const near = nearestStandard(value, series);
  const fitted = nearestStandard(v.nominal, series);
  const ratio = near.nearest / v.nominal;
  const decades = Math.log10(ratio);
  if (Math.abs(decades - Math.round(decades)) < 1e-3 && Math.round(decades) !== 0)
    return { value: near.nearest, cls: Math.abs(Math.round(decades)) === 1 ? 'decade' : 'decade2' };
  if (near.nearest === fitted.below || near.nearest === fitted.above) return { value: near.nearest, cls: 'neighbour' };
  return { value: near.nearest, cls: 'standard' };
}
