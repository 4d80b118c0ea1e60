import type { Band, Verdict } from '../analysis/types.js';
import type { Unit } from '../units/unit.js';
import type { CapabilityStatus } from './capability.js';
import type { SnapshotProblem } from './bands.js';

/** One board's latest (and first) reading of one check, as the index holds it. */
export interface BatchPoint {
  readonly serial: string;
  readonly value: number;
  readonly at: string;
  readonly verdict: Verdict;
  readonly firstVerdict: Verdict;
  /** Plan hash of the board's latest run. */
  readonly revision: string | null;
}

export type OutlierReason = 'outside band' | 'beyond 3σ';

/** A board whose latest reading of a check stands out. */
export interface Outlier {
  readonly serial: string;
  readonly check: string;
  readonly value: number;
  readonly at: string;
  readonly reasons: readonly OutlierReason[];
  /** (value − mean) / sd, or null when the spread is unknown. */
  readonly z: number | null;
}

/** Batch figures of one check of one plan (DESIGN §7 `batch --json` keys first). */
export interface BatchCheck {
  readonly check: string;
  readonly n: number;
  readonly pass: number;
  readonly marginal: number;
  readonly fail: number;
  readonly mean: number | null;
  readonly sd: number | null;
  readonly min: number | null;
  readonly max: number | null;
  readonly cp: number | null;
  readonly cpk: number | null;
  readonly plan: string | null;
  readonly unit: Unit | null;
  readonly nominal: number | null;
  /** The worst-case band Cp and Cpk are taken against. */
  readonly band: Band | null;
  /** Plan hash the band comes from (the newest revision measured). */
  readonly bandRevision: string | null;
  /** True when boards of other revisions were judged against a different band. */
  readonly bandsDiffer: boolean;
  /** Share of boards whose first reading of this check passed. */
  readonly firstPassYield: number | null;
  /** Share of boards whose latest reading of this check passes. */
  readonly finalYield: number | null;
  readonly status: CapabilityStatus;
  readonly note: string;
  readonly outliers: readonly Outlier[];
  /** Every board's point, in index order (the histogram counts them, the trend sorts them). */
  readonly points: readonly BatchPoint[];
}

/** The whole batch. */
export interface BatchFigures {
  /** Boards with at least one reading in the filter. */
  readonly boards: number;
  /** Boards whose first reading of every check they have passed. */
  readonly firstPassBoards: number;
  /** Boards whose latest reading of every check they have passes. */
  readonly finalPassBoards: number;
  readonly firstPassYield: number | null;
  readonly finalYield: number | null;
  /** Boards that lack a reading of some check of their plan revision. */
  readonly incomplete: number;
  /** Checks in plan order. */
  readonly checks: readonly BatchCheck[];
  /** Plan snapshots that would not load, and boards left out of the figures (a damaged file), each with why. */
  readonly problems: readonly BatchProblem[];
}

/** Something the figures could not use: a plan snapshot (`hash`) or a whole board (`serial`), and why. */
export interface BatchProblem {
  readonly message: string;
  readonly hash?: string;
  readonly serial?: string;
}
