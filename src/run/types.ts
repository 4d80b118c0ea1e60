import type { Target, Verdict } from '../analysis/types.js';
import type { InputRef } from '../plan/types.js';
import type { Unit } from '../units/unit.js';

/** A reading the run knows of: already saved in the log (the run never holds unsaved values). */
export interface RunReading {
  readonly id: string;
  readonly check: string;
  /** SI base units. */
  readonly value: number;
  readonly unit: Unit;
  readonly verdict: Verdict;
  /** ISO 8601. */
  readonly at: string;
  /** The text as typed, when known. */
  readonly raw?: string;
  /** `captures/<hash>.<ext>` when the value came from a capture. */
  readonly capture?: string;
  /**
   * What was wrong with the captured shape (a square where a sine is expected,
   * flat tops, a crossover notch): even a figure inside its band then sends the
   * next suggestion upstream, as a marginal reading would.
   */
  readonly shapeWarning?: string;
}

/** A rework note the run knows of (already saved). */
export interface RunRework {
  readonly id: string;
  /** `<stage>.<role>` (`osc.Ct`), `<stage>.<anything>` or `rails.<id>`. */
  readonly part: string;
  readonly from: string;
  readonly to: string;
  readonly note: string;
  readonly at: string;
}

/** The suggested next check and why, in a technician's words. */
export interface Suggestion {
  readonly check: string;
  readonly why: string;
}

export type EndOutcome = 'passed' | 'failed' | 'aborted';

/** The part of a plan the run needs: which stage feeds which. */
export interface RunPlanShape {
  readonly stages: readonly { readonly id: string; readonly input?: InputRef }[];
}

/**
 * The state of one bring-up run. Immutable: every action that changes something
 * returns a new object, and every impossible move returns this very object.
 */
export interface RunState {
  /** Targets in safe bring-up order (as `computeTargets` returns them). */
  readonly targets: readonly Target[];
  /** Stage id → ids of every stage downstream of it (signals flow down the chain). */
  readonly downstream: ReadonlyMap<string, readonly string[]>;
  /** The cautions of first power have not been acknowledged in this sitting. */
  readonly isCautionsPending: boolean;
  /** The idle current went over its limit: everything waits until power-off is acknowledged. */
  readonly isPowerOff: boolean;
  /** The run has ended with this outcome, or null while it is open. */
  readonly ended: EndOutcome | null;
  /** Every reading of this run, oldest first. */
  readonly readings: readonly RunReading[];
  /** The latest reading of each check. */
  readonly latest: ReadonlyMap<string, RunReading>;
  /** Checks whose latest reading no longer counts (a rework or a power-off since). */
  readonly stale: ReadonlySet<string>;
  readonly rework: readonly RunRework[];
  /** The check in the panel, whose input line takes the next value. */
  readonly selected: string | null;
  /** The latest reading of this sitting's most recent record action, for the verdict panel. */
  readonly last: RunReading | null;
  readonly suggestion: Suggestion | null;
}

/** Everything that can happen in a run (discriminated by `type`). */
export type RunAction =
  | { readonly type: 'acknowledge-cautions' }
  | { readonly type: 'select-check'; readonly check: string }
  | { readonly type: 'record-reading'; readonly reading: RunReading }
  | { readonly type: 'power-off-acknowledged' }
  | { readonly type: 'note-rework'; readonly rework: RunRework }
  | {
      readonly type: 'resume';
      readonly readings: readonly RunReading[];
      readonly rework?: readonly RunRework[];
      /** The run had already ended with this outcome: show it, take nothing more. */
      readonly ended?: EndOutcome | null;
    }
  | { readonly type: 'end-run'; readonly outcome: EndOutcome };
