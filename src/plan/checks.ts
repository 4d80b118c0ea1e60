import type { CheckSpec } from '../circuit/types.js';
import type { Unit } from '../units/unit.js';
import type { Phase, PlanStage, Rail } from './types.js';

/** A check of a plan, before any numbers: what, where, and in which phase of a safe bring-up. */
export interface PlanCheck {
  /** DESIGN §4 id: `rails.+12V.dc`, `osc.freq`. */
  readonly check: string;
  /** Stage id, or `rails`. */
  readonly stage: string;
  /** Key relative to the stage (`freq`, `out.vpp`), or the rail check (`+12V.dc`). */
  readonly key: string;
  readonly quantity: string;
  readonly unit: Unit;
  readonly instrument: CheckSpec['instrument'];
  readonly how: string;
  readonly testPoint: string | null;
  readonly phase: Phase;
  /** The rail a rail check is about. */
  readonly rail?: string;
  /** Which figure of a scope capture answers the check, as its stage kind declares (absent: none). */
  readonly captureFigure?: CheckSpec['captureFigure'];
  /** The quantity's physical floor (CheckSpec.floor), when it has one. */
  readonly floor?: number;
  /** A design figure nobody probes (CheckSpec.isDesignFigure): in targets, never on the bring-up list. */
  readonly isDesignFigure?: boolean;
}

/** The id of the idle-current check (DESIGN §4, contract). */
export const idleCurrentCheck = 'rails.idle-current';

/**
 * Every check of a plan in safe bring-up order (DESIGN §5): each rail's
 * resistance to ground unpowered, the idle current at first power through a
 * current-limited supply, each rail's DC level, then every stage's checks in
 * chain order.
 */
export function planChecks(plan: { readonly rails: readonly Rail[]; readonly stages: readonly PlanStage[] }): PlanCheck[] {
  const out: PlanCheck[] = [];
  for (const rail of plan.rails) {
    out.push({
      check: `rails.${rail.id}.to-ground`,
      stage: 'rails',
      key: `${rail.id}.to-ground`,
      quantity: 'resistance to ground, unpowered',
      unit: 'Ω',
      instrument: 'meter',
      how: `power off and disconnected: ohmmeter from the ${rail.id} rail to ground (probe polarity both ways if it drifts)`,
      testPoint: rail.testPoint ?? null,
      phase: 'unpowered',
      rail: rail.id,
    });
  }
  out.push({
    check: idleCurrentCheck,
    stage: 'rails',
    key: 'idle-current',
    quantity: 'idle supply current',
    unit: 'A',
    instrument: 'meter',
    how: 'bench supply with its current limit set just above the limit; read the supply current with no signal or load applied',
    testPoint: null,
    phase: 'first-power',
    // A board cannot draw less than nothing from the supply.
    floor: 0,
  });
  for (const rail of plan.rails) {
    out.push({
      check: `rails.${rail.id}.dc`,
      stage: 'rails',
      key: `${rail.id}.dc`,
      quantity: 'rail voltage',
      unit: 'V',
      instrument: 'meter',
      how: `DC voltmeter from the ${rail.id} rail to ground`,
      testPoint: rail.testPoint ?? null,
      phase: 'rails',
      rail: rail.id,
    });
  }
  for (const stage of plan.stages) {
    for (const spec of stage.module.checks(stage.settings)) {
      const tp = stage.testPoints[spec.key] ?? (spec.output === undefined ? undefined : stage.testPoints[spec.output]);
      out.push({
        check: `${stage.id}.${spec.key}`,
        stage: stage.id,
        key: spec.key,
        quantity: spec.quantity,
        unit: spec.unit,
        instrument: spec.instrument,
        how: spec.how,
        testPoint: tp ?? null,
        phase: 'stage',
        ...(spec.captureFigure ? { captureFigure: spec.captureFigure } : {}),
        ...(spec.floor === undefined ? {} : { floor: spec.floor }),
        ...(spec.isDesignFigure ? { isDesignFigure: true } : {}),
      });
    }
  }
  return out;
}
