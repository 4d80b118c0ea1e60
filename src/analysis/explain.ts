import { buildChain } from '../plan/chain.js';
import { upstreamOf } from '../plan/stages.js';
import type { Plan } from '../plan/types.js';
import { nearestStandard } from '../units/e-series.js';
import { formatPercent, formatValue } from '../units/format.js';
import type { Unit } from '../units/unit.js';
import { solveForValue } from './solve.js';

/** One part value that would explain a reading, with everything else nominal. */
export interface Explanation {
  /** `<stage>.<role>` or `rails.<id>`. */
  readonly part: string;
  readonly unit: Unit;
  readonly fitted: number;
  /** The value this part would need to give the reading. */
  readonly wouldBe: number;
  /** wouldBe / fitted. */
  readonly ratio: number;
  readonly likely: 'x10-slip' | 'neighbour-value' | 'standard-value' | 'drift';
  readonly note: string;
  /** 0…1, higher is more likely; the list is sorted by it. */
  readonly score: number;
}

/** Units whose parts come in preferred values (IEC 60063:2015), so a wrong value is a likely fault. */
const seriesUnits: ReadonlySet<Unit> = new Set<Unit>(['Ω', 'F', 'H']);

/** How far (as a ratio) the search for an explaining value reaches either side of the fitted one. */
export const explainReach = 30;

/**
 * Which single part would explain a reading (DESIGN §5.2). For every
 * toleranced value of the check's stage and of every stage upstream of it
 * (and the rails), solve for the value that reproduces the reading with all
 * others nominal (a log-spaced scan of 1/30 … 30× the fitted value, then
 * bisection on each sign change; the root nearest the fitted value wins).
 * Each answer is ranked: a ×10 (or ×0.1, ×100) slip or a neighbouring
 * standard value (E24/E12) is a likely wrong part; drift is less likely the
 * further it lies. Most likely first. An unknown check gives an empty list.
 */
export function explainReading(plan: Plan, check: string, reading: number): Explanation[] {
  if (!Number.isFinite(reading)) return [];
  const chain = buildChain(plan);
  const index = chain.checks.findIndex((c) => c.check === check);
  const target = chain.checks[index];
  if (!target || target.phase === 'unpowered' || target.phase === 'first-power') return [];
  // A hand-written (manual) target has no model: its band is not a part that could be wrong.
  const modelled = (id: string) => plan.stages.find((s) => s.id === id)?.module.traits?.isHandWritten !== true;
  const stages = new Set((target.stage === 'rails' ? [] : [target.stage, ...upstreamOf(plan.stages, target.stage)]).filter(modelled));
  // Stages after the check's own cannot change it: leave them out of the search.
  const upTo = chain.stageIndex(target.stage) + 1;
  const out = new Float64Array(chain.checks.length);
  const x = Float64Array.from(chain.nominal);
  const list: Explanation[] = [];
  chain.variables.forEach((v, i) => {
    if (v.nominal === 0) return;
    if (v.stage !== 'rails' && !stages.has(v.stage)) return;
    if (v.stage === 'rails' && target.stage === 'rails' && target.rail !== v.role) return;
    // Stages before this part's own see only nominal values: take them from the nominal evaluation.
    const reuse = v.stage === 'rails' ? 0 : chain.stageIndex(v.stage);
    const valueAt = (ratio: number): number => {
      x[i] = v.nominal * ratio;
      chain.evaluate(x, out, upTo, reuse);
      x[i] = v.nominal;
      return out[index] as number;
    };
    const ratio = solveForValue(valueAt, reading, 1 / explainReach, explainReach);
    if (ratio === undefined || Math.abs(ratio - 1) < 1e-6) return;
    list.push(classify(v.name, v.unit, v.nominal, v.tol, ratio, v.stage === 'rails'));
  });
  return list.sort((a, b) => b.score - a.score);
}

function classify(part: string, unit: Unit, fitted: number, tol: number, ratio: number, isRail: boolean): Explanation {
  const wouldBe = fitted * ratio;
  const base = { part, unit, fitted, wouldBe, ratio };
  const shown = formatValue(Math.abs(wouldBe) < 1e-300 ? 0 : wouldBe, unit);
  const fittedText = formatValue(fitted, unit);
  // Drift: the further from fitted, the less likely (a part rarely drifts by more than a few tolerances).
  const driftScore = 0.5 * Math.exp(-Math.abs(Math.log(ratio)) / 0.3);
  if (isRail) {
    return {
      ...base,
      likely: 'drift',
      score: driftScore * 0.8,
      note: `the rail would read ${shown} instead of ${fittedText}: read ${part}.dc and the regulator`,
    };
  }
  if (Math.abs(ratio - 1) <= tol) {
    return {
      ...base,
      likely: 'drift',
      score: driftScore,
      note: `${part} at ${shown} (${formatPercent(ratio - 1)}) is still inside its ${formatPercent(tol)} tolerance: several parts together may add up`,
    };
  }
  if (seriesUnits.has(unit) && wouldBe > 0) {
    const decades = Math.log10(ratio);
    const k = Math.round(decades);
    const slack = Math.log10(1 + tol + 0.03);
    if (k !== 0 && Math.abs(decades - k) <= slack) {
      const factor = k > 0 ? `×${10 ** k}` : `×${(10 ** k).toString()}`;
      const fit = 1 - Math.abs(decades - k) / slack / 2;
      return {
        ...base,
        likely: 'x10-slip',
        score: (0.95 - 0.1 * (Math.abs(k) - 1)) * fit,
        note: `a ${shown} part (${factor} the fitted ${fittedText}) would read this: a decade slip — check the marking (three-digit code: the last digit is the number of zeros)`,
      };
    }
    for (const series of ['E12', 'E24'] as const) {
      const std = nearestStandard(wouldBe, series);
      if (Math.abs(std.error) > Math.max(tol, 0.01) + 0.01) continue;
      const near = nearestStandard(fitted, series);
      if (Math.abs(std.nearest / near.nearest - 1) < 1e-6) continue;
      const stdText = formatValue(std.nearest, unit);
      const fit = 1 - Math.abs(std.error) / (Math.max(tol, 0.01) + 0.01) / 2;
      if (std.nearest === near.below || std.nearest === near.above) {
        return {
          ...base,
          likely: 'neighbour-value',
          score: 0.85 * fit,
          note: `a ${stdText} part, the ${series} neighbour of the fitted ${fittedText}, would read this: check that the right value was fitted`,
        };
      }
      return { ...base, likely: 'standard-value', score: 0.6 * fit, note: `a ${stdText} part (a standard value) would read this: a wrong part from the kit?` };
    }
  }
  return {
    ...base,
    likely: 'drift',
    score: driftScore,
    note: `${part} would have to be ${shown} (${formatPercent(ratio - 1)} from the fitted ${fittedText}): out of tolerance, damaged, or a poor joint`,
  };
}

/** The stage's fault hints for a check (DESIGN §5.2), or the supply's for rail checks. */
export function hintsFor(plan: Plan, check: string): string[] {
  if (check.startsWith('rails.')) {
    if (check === 'rails.idle-current')
      return [
        'a reversed electrolytic or tantalum capacitor',
        'a reversed or wrong-type op-amp or transistor (feel for a hot part)',
        'a solder bridge between a rail and ground',
      ];
    if (check.endsWith('.to-ground'))
      return ['a solder bridge or a whisker between the rail and ground', 'a reversed polarised capacitor', 'a shorted decoupling capacitor'];
    return [
      'the regulator and its set resistors',
      'the bench supply setting and its current limit (a supply in current limit sags)',
      'a heavy load downstream pulling the rail down',
    ];
  }
  const stage = [...plan.stages].sort((a, b) => b.id.length - a.id.length).find((s) => check.startsWith(`${s.id}.`));
  if (!stage) return [];
  const key = check.slice(stage.id.length + 1);
  const hints = stage.module.faultHints[key];
  if (hints) return [...hints];
  // `out.vpp` falls back to the hints of `out`, if the stage keeps them per output.
  const head = key.split('.')[0] ?? key;
  return [...(stage.module.faultHints[head] ?? [])];
}
