import { useMemo } from 'react';
import { type Diagnosis, diagnose } from '../../analysis/diagnose.js';
import type { Target } from '../../analysis/types.js';
import { buildChain } from '../../plan/chain.js';
import type { Plan } from '../../plan/types.js';
import type { RunState } from '../../run/types.js';

/**
 * The diagnosis of the run so far (DESIGN §5a), once the latest reading is
 * outside its band: every current reading of the run (stale ones, made before
 * a rework or a power-off, left out), recomputed only when they change.
 */
export function useDiagnosis(plan: Plan, targets: readonly Target[], state: Pick<RunState, 'latest' | 'stale' | 'last'>): Diagnosis | null {
  const chain = useMemo(() => buildChain(plan), [plan]);
  const last = state.last;
  return useMemo(() => {
    if (!last || last.verdict === 'pass' || state.stale.has(last.check)) return null;
    // The safety checks (rail to ground, idle current) have no model to diagnose: their hints say it.
    const phase = targets.find((t) => t.check === last.check)?.phase;
    if (phase !== 'stage' && phase !== 'rails') return null;
    const readings = [...state.latest.values()].filter((r) => !state.stale.has(r.check));
    try {
      return diagnose(plan, targets, readings, { chain, top: 3 });
    } catch {
      // A model that cannot be evaluated leaves the hints alone on the screen.
      return null;
    }
  }, [plan, targets, chain, last, state.latest, state.stale]);
}
