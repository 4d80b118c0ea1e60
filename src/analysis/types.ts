import type { CheckSpec } from '../circuit/types.js';
import type { Phase } from '../plan/types.js';
import type { Unit } from '../units/unit.js';

/** A closed interval in the check's unit. */
export interface Band {
  readonly min: number;
  readonly max: number;
}

/** Where a check sits in a safe bring-up (defined with the plan's checks). */
export type { Phase };

/** One part's share of a band (normalised so that shares sum to 1). */
export interface Contributor {
  /** `<stage>.<role>` or `rails.<id>`. */
  readonly part: string;
  readonly share: number;
}

/** What a check should read, and how far it may honestly stray. */
export interface Target {
  /** Check id per DESIGN §4: `<stage>.<output>.<quantity>` or `<stage>.<quantity>`. */
  readonly check: string;
  /** Stage id, or `rails`. */
  readonly stage: string;
  readonly quantity: string;
  readonly unit: Unit;
  readonly nominal: number;
  readonly worst: Band;
  readonly stat: Band;
  readonly testPoint: string | null;
  readonly contributors: readonly Contributor[];
  readonly instrument: 'meter' | 'scope' | 'counter';
  /** How to measure it, one short line. */
  readonly how: string;
  readonly phase: Phase;
  /**
   * A limit check (the unpowered rail-to-ground resistance, the idle current):
   * its band is a threshold (≥ / ≤) and its `nominal` only that threshold or the
   * middle of 0 … limit, so a deviation from nominal means nothing. Always set by
   * `computeTargets`; optional only so hand-built targets elsewhere need not name it.
   */
  readonly isLimit?: boolean;
  /**
   * The quantity's physical floor (0 for a dead band, a THD, an idle current):
   * where the band reaches down to it, the verdict guards only the open side.
   */
  readonly floor?: number;
  /** Stage ids upstream of this check's stage, nearest first (empty for rails and chain heads). */
  readonly upstream?: readonly string[];
  /** The upstream output this check's stage takes (`"osc.triangle"`), when it has an input. */
  readonly input?: string;
  /**
   * How the worst-case band was bound: every corner of the box (`corners`), the
   * sensitivity corner confirmed by a local search (`monotone`), or a search of
   * the box for a check that does not move one way with every part (`search`).
   * Absent on limit checks (their band is a threshold).
   */
  readonly method?: 'corners' | 'monotone' | 'search';
  /** Which figure of a scope capture answers the check, as its stage kind declares (absent: none). */
  readonly captureFigure?: CheckSpec['captureFigure'];
  /** A design figure nobody probes at a test point (a base drive current): listed, never asked for. */
  readonly isDesignFigure?: boolean;
}

export interface DesignWarning {
  readonly stage: string;
  readonly message: string;
}

/** The result of `computeTargets`. */
export interface TargetSet {
  readonly plan: string;
  readonly targets: readonly Target[];
  readonly warnings: readonly DesignWarning[];
  /**
   * The bands are a first estimate from the sensitivities alone (`quickTargets`,
   * the plan editor's per-keystroke pass), neither searched nor sampled: shown
   * as such until the full set replaces them, never cached. @default false
   */
  readonly isEstimate?: boolean;
}

/** DESIGN §4 verdict names (contract). */
export type Verdict = 'pass' | 'marginal' | 'fail';

/** A verdict with the figures behind it. */
export interface VerdictResult {
  readonly verdict: Verdict;
  /** Expanded uncertainty U of the reading, in its unit. */
  readonly uncertainty: number;
  /** (reading − nominal) / |nominal|; NaN when the nominal is 0. */
  readonly deviation: number;
  /** Position in the worst-case band: 0 at min, 1 at max, outside [0, 1] when outside. */
  readonly position: number;
  /** Suspect-but-usable notes (e.g. the band is narrower than the instrument can resolve). */
  readonly warnings: readonly string[];
}
