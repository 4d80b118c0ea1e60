import { useEffect, useRef, useState } from 'react';
import { quickTargets } from '../../analysis/quick-targets.js';
import { computeTargets } from '../../analysis/targets.js';
import type { TargetSet } from '../../analysis/types.js';
import type { PlanError } from '../../plan/errors.js';
import { checkPlanText, loadPlanText } from '../../plan/load.js';
import { refineOffThread } from './refine-off-thread.js';

export interface LiveTargetOptions {
  /** Trials of the statistical pass. @default 10000 (as `probebook targets`) */
  readonly trials: number;
  readonly seed: number;
  /** Wait after the last change before the statistical pass starts, ms. @default 300 */
  readonly refineDelay?: number;
}

/**
 * `checking` the plan; `problems` it does not load (the last targets stay on
 * screen, marked stale); `refining` worst case and nominal are fresh, the
 * statistical band is computing; `done` everything fresh.
 */
export type LiveStatus = 'checking' | 'problems' | 'refining' | 'done';

export interface LiveTargets {
  readonly status: LiveStatus;
  readonly set: TargetSet | null;
  /** The targets shown belong to an earlier draft (the current one does not load). */
  readonly isStale: boolean;
  readonly problems: readonly PlanError[];
  /** Statistical pass, 0…1. */
  readonly progress: number;
  /** How long the quick pass (nominal and the estimated bands) took, ms. */
  readonly quickMs: number;
  readonly error?: string;
}

/** Coalesce fast typing (a paste, key repeat) into one computation, ms. */
const settleMs = 25;

/**
 * The targets of the plan being edited, following every change: a quick pass
 * on this thread as soon as typing pauses (the nominal, and both bands estimated
 * from the sensitivities: `quickTargets`, a few ms where the worst-case search
 * took a hundred or more), then the searched worst case and the statistical
 * band in a worker, shown as refining until they are done. A newer text cancels whatever is running for an
 * older one, so a stale result is never shown as fresh.
 */
export function useLiveTargets(text: string, file: string, options: LiveTargetOptions): LiveTargets {
  const [state, setState] = useState<LiveTargets>({ status: 'checking', set: null, isStale: false, problems: [], progress: 0, quickMs: 0 });
  const last = useRef<TargetSet | null>(null);
  useEffect(() => {
    let isLive = true;
    let cancelRefine: (() => void) | undefined;
    let refineTimer: NodeJS.Timeout | undefined;
    const quickTimer = setTimeout(() => {
      if (!isLive) return;
      const problems = checkPlanText(text, file);
      if (problems.length > 0) {
        setState({ status: 'problems', set: last.current, isStale: last.current !== null, problems, progress: 0, quickMs: 0 });
        return;
      }
      const started = performance.now();
      let quick: TargetSet;
      try {
        // Nominal exactly, bands estimated from the sensitivities (milliseconds); the worker refines both bands.
        quick = quickTargets(loadPlanText(text, file));
      } catch (error) {
        setState({
          status: 'problems',
          set: last.current,
          isStale: true,
          problems: [],
          progress: 0,
          quickMs: 0,
          error: error instanceof Error ? error.message : String(error),
        });
        return;
      }
      const quickMs = performance.now() - started;
      last.current = quick;
      setState({ status: 'refining', set: quick, isStale: false, problems: [], progress: 0, quickMs });
      refineTimer = setTimeout(() => {
        if (!isLive) return;
        const finish = (set: TargetSet) => {
          if (!isLive) return;
          last.current = set;
          setState({ status: 'done', set, isStale: false, problems: [], progress: 1, quickMs });
        };
        let shown = 0;
        const job = refineOffThread(text, file, options.trials, options.seed, (done, total) => {
          // A few steps are enough on screen; each redraw costs the UI thread.
          const step = Math.floor((10 * done) / total) / 10;
          if (isLive && step > shown) {
            shown = step;
            setState((s) => ({ ...s, progress: step }));
          }
        });
        if (!job) return finish(computeTargets(loadPlanText(text, file), { trials: options.trials, seed: options.seed }));
        cancelRefine = job.cancel;
        job.done.then(finish, (error: unknown) => {
          if (isLive) setState((s) => ({ ...s, status: 'done', error: `statistical band: ${error instanceof Error ? error.message : String(error)}` }));
        });
      }, options.refineDelay ?? 300);
    }, settleMs);
    return () => {
      isLive = false;
      clearTimeout(quickTimer);
      clearTimeout(refineTimer);
      cancelRefine?.();
    };
  }, [text, file, options.trials, options.seed, options.refineDelay]);
  return state;
}
