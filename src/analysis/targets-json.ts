import type { Band, TargetSet } from './types.js';

/** A band side for JSON: a finite number, or null for an unbounded (±Infinity) or unknown (NaN) side. */
function side(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

function band(b: Band): { min: number | null; max: number | null } {
  return { min: side(b.min), max: side(b.max) };
}

/**
 * The `targets --json` document (DESIGN §7, contract keys), in SI base units.
 * Unbounded band sides (a rail's resistance to ground has no maximum) are
 * written as `null`, since JSON has no infinity. Extra keys per target:
 * `phase`, `instrument`, `how`, `contributors`, `floor` where the
 * quantity has a physical floor (the verdict guards only the band's open side),
 * and `designFigure: true` on a figure nobody probes at a test point (a peak base current),
 * and `method` (how the worst-case band was bound: `corners`, `monotone` or
 * `search`; absent on limit checks).
 */
export function targetsJson(set: TargetSet): unknown {
  return {
    plan: set.plan,
    targets: set.targets.map((t) => ({
      check: t.check,
      stage: t.stage,
      quantity: t.quantity,
      unit: t.unit,
      nominal: side(t.nominal),
      worst: band(t.worst),
      stat: band(t.stat),
      testPoint: t.testPoint,
      phase: t.phase,
      instrument: t.instrument,
      how: t.how,
      contributors: t.contributors.map((c) => ({ part: c.part, share: c.share })),
      ...(t.floor === undefined ? {} : { floor: t.floor }),
      ...(t.isDesignFigure ? { designFigure: true } : {}),
      ...(t.method ? { method: t.method } : {}),
    })),
    warnings: set.warnings.map((w) => ({ stage: w.stage, message: w.message })),
  };
}
