import type { Target } from '../analysis/types.js';
import { downstreamMap } from './graph.js';
import { suggestNext } from './suggest.js';
import type { RunPlanShape, RunState } from './types.js';

/**
 * A fresh run: nothing measured, the cautions waiting to be acknowledged, the
 * first check (an unpowered one, in a safe plan) selected and suggested.
 */
export function createRunState(plan: RunPlanShape, all: readonly Target[]): RunState {
  // Design figures (a peak base current) have no test point: the run never asks for them.
  const targets = all.some((t) => t.isDesignFigure) ? all.filter((t) => !t.isDesignFigure) : all;
  const base: RunState = {
    targets,
    downstream: downstreamMap(plan),
    isCautionsPending: true,
    isPowerOff: false,
    ended: null,
    readings: [],
    latest: new Map(),
    stale: new Set(),
    rework: [],
    selected: null,
    last: null,
    suggestion: null,
  };
  const suggestion = suggestNext(base);
  return { ...base, suggestion, selected: suggestion?.check ?? targets[0]?.check ?? null };
}
