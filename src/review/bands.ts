import type { Band, Target } from '../analysis/types.js';
import type { Unit } from '../units/unit.js';

/** What the review needs of a target: the band a reading was judged against. */
export interface CheckBand {
  readonly check: string;
  readonly unit: Unit;
  readonly nominal: number;
  readonly worst: Band;
  readonly stat: Band;
  readonly testPoint: string | null;
  readonly how: string;
  /** A limit check (≥ / ≤): its nominal is only the threshold, nothing to deviate from (`Target.isLimit`). */
  readonly isLimit: boolean;
}

/** The targets of one plan snapshot, by check id. */
export interface SnapshotBands {
  readonly hash: string;
  readonly plan: string;
  /** Check ids in plan order. */
  readonly order: readonly string[];
  readonly bands: ReadonlyMap<string, CheckBand>;
}

/** A snapshot that could not be turned into targets, and why. */
export interface SnapshotProblem {
  readonly hash: string;
  readonly message: string;
}

/** What the target engine returns, as far as the review needs it. */
export interface TargetList {
  readonly plan: string;
  readonly targets: readonly Pick<Target, 'check' | 'unit' | 'nominal' | 'worst' | 'stat' | 'testPoint' | 'how' | 'isLimit'>[];
}

export interface BandSourceDeps {
  /** The exact plan text of a snapshot (the log's `readPlanSnapshot`), or null. */
  readonly readSnapshot: (hash: string) => Promise<string | null>;
  /** Load a plan text and compute its targets (the plan loader and target engine). */
  readonly targetsOf: (text: string, hash: string) => TargetList | Promise<TargetList>;
}

/** Targets per plan hash, computed once per hash however often they are asked for. */
export interface BandSource {
  get(hash: string): Promise<SnapshotBands | null>;
  /** Load several at once; the map holds only the hashes that loaded. */
  load(hashes: Iterable<string>): Promise<ReadonlyMap<string, SnapshotBands>>;
  /** Snapshots that were missing or would not load, for a warning line. */
  problems(): readonly SnapshotProblem[];
}

/** Reduce a target set to the bands the review needs. */
export function toSnapshotBands(hash: string, set: TargetList): SnapshotBands {
  const bands = new Map<string, CheckBand>();
  for (const t of set.targets) {
    bands.set(t.check, {
      check: t.check,
      unit: t.unit,
      nominal: t.nominal,
      worst: t.worst,
      stat: t.stat,
      testPoint: t.testPoint,
      how: t.how,
      isLimit: t.isLimit ?? false,
    });
  }
  return { hash, plan: set.plan, order: [...bands.keys()], bands };
}

/**
 * A cache of targets by plan hash. The log keeps the exact plan text each run
 * used, so the band shown beside an old reading is the one it was judged by,
 * even after the plan file has moved on.
 */
export function createBandSource(deps: BandSourceDeps): BandSource {
  const cache = new Map<string, Promise<SnapshotBands | null>>();
  const problems = new Map<string, string>();
  const get = (hash: string): Promise<SnapshotBands | null> => {
    let entry = cache.get(hash);
    if (!entry) {
      entry = (async () => {
        const text = await deps.readSnapshot(hash);
        if (text === null) {
          problems.set(hash, `plan snapshot ${hash.slice(0, 12)} is missing from the log`);
          return null;
        }
        try {
          return toSnapshotBands(hash, await deps.targetsOf(text, hash));
        } catch (error) {
          const message = error instanceof Error ? error.message.split('\n')[0] : String(error);
          problems.set(hash, `plan snapshot ${hash.slice(0, 12)} would not load: ${message}`);
          return null;
        }
      })();
      cache.set(hash, entry);
    }
    return entry;
  };
  return {
    get,
    async load(hashes) {
      const out = new Map<string, SnapshotBands>();
      for (const hash of new Set(hashes)) {
        const bands = await get(hash);
        if (bands) out.set(hash, bands);
      }
      return out;
    },
    problems: () => [...problems].map(([hash, message]) => ({ hash, message })),
  };
}
