import type { Band } from '../analysis/types.js';
import type { BoardSummary, DamagedBoard, LogIndex } from '../log/types.js';
import type { SnapshotBands, SnapshotProblem } from './bands.js';
import type { BatchCheck, BatchFigures, BatchPoint, BatchProblem, Outlier, OutlierReason } from './batch-types.js';
import { capabilityOf } from './capability.js';
import { boardMatches, checkMatches, type BatchFilter } from './filter.js';
import { spreadOf } from './stats.js';

interface Group {
  readonly plan: string | null;
  readonly check: string;
  readonly points: BatchPoint[];
}

/** Feeds boards one at a time, so a long scan can yield to the screen between chunks. */
export interface BatchAccumulator {
  add(board: BoardSummary): void;
  finish(problems?: readonly SnapshotProblem[]): BatchFigures;
}

/**
 * Start a batch scan over index boards with the bands of their plan snapshots.
 * Boards whose file is damaged (`damaged`, from the index) are left out of every
 * figure, never counted from an older summary, and named in `problems` with why.
 */
export function batchAccumulator(bands: ReadonlyMap<string, SnapshotBands>, filter: BatchFilter = {}, damaged: readonly DamagedBoard[] = []): BatchAccumulator {
  const leftOut = new Set(damaged.map((d) => d.serial));
  const boardProblems: BatchProblem[] = damaged.map((d) => ({ serial: d.serial, message: `board ${d.serial} is left out of these figures: ${d.message}` }));
  const groups = new Map<string | null, Map<string, Group>>();
  let boards = 0;
  let firstPassBoards = 0;
  let finalPassBoards = 0;
  let incomplete = 0;
  return {
    add(board) {
      if (leftOut.has(board.serial) || !boardMatches(board, filter)) return;
      // Groups by plan, then by check id: the ids are the index's own keys, so no key strings are built per reading.
      let byCheck = groups.get(board.plan);
      if (!byCheck) groups.set(board.plan, (byCheck = new Map()));
      let any = false;
      let firstOk = true;
      let finalOk = true;
      // Read once: the store may hand out `checks` through a lazy getter.
      const checks = board.checks;
      for (const check in checks) {
        const summary = checks[check];
        if (!summary || !checkMatches(check, summary, filter)) continue;
        any = true;
        if (summary.first.verdict !== 'pass') firstOk = false;
        if (summary.latest.verdict !== 'pass') finalOk = false;
        let group = byCheck.get(check);
        if (!group) byCheck.set(check, (group = { plan: board.plan, check, points: [] }));
        group.points.push({
          serial: board.serial,
          value: summary.latest.value,
          at: summary.latest.at,
          verdict: summary.latest.verdict,
          firstVerdict: summary.first.verdict,
          revision: board.planHash,
        });
      }
      if (!any) return;
      boards++;
      if (firstOk) firstPassBoards++;
      if (finalOk) finalPassBoards++;
      const own = board.planHash ? bands.get(board.planHash) : undefined;
      if (own && filter.check === undefined && own.order.some((c) => !(c in checks))) incomplete++;
    },
    finish(problems = []) {
      const checks = [...groups.values()].flatMap((byCheck) => [...byCheck.values()].map((g) => checkFigures(g, bands)));
      checks.sort(planOrder(bands));
      return {
        boards,
        firstPassBoards,
        finalPassBoards,
        firstPassYield: boards > 0 ? firstPassBoards / boards : null,
        finalYield: boards > 0 ? finalPassBoards / boards : null,
        incomplete,
        checks,
        problems: [...boardProblems, ...problems],
      };
    },
  };
}

/**
 * Batch figures from the index alone: per board per check the index holds the
 * first and latest reading, which is all yield, spread and capability need, so
 * no board file is opened however large the log.
 */
export function batchFigures(
  index: LogIndex,
  bands: ReadonlyMap<string, SnapshotBands>,
  filter: BatchFilter = {},
  problems: readonly SnapshotProblem[] = [],
): BatchFigures {
  const acc = batchAccumulator(bands, filter, index.damaged);
  for (const serial in index.boards) {
    const board = index.boards[serial];
    if (board) acc.add(board);
  }
  return acc.finish(problems);
}

/** Plan hashes of the boards a filter selects (the snapshots to load). */
export function revisionsOf(index: LogIndex, filter: BatchFilter = {}): string[] {
  const out = new Set<string>();
  for (const serial in index.boards) {
    const board = index.boards[serial];
    if (board?.planHash && boardMatches(board, filter)) out.add(board.planHash);
  }
  return [...out];
}

function checkFigures(group: Group, bands: ReadonlyMap<string, SnapshotBands>): BatchCheck {
  // Points stay in index order; the trend sorts the one check it draws.
  const points = group.points;
  const values = points.map((p) => p.value);
  const spread = spreadOf(values);
  const own = revisionBands(group.check, bands);
  // The band of the newest revision measured is the one the batch is judged by now.
  // ISO 8601 UTC times as the store writes them compare as strings in time order.
  let bandRevision: string | null = null;
  let newest = '';
  for (const p of points) {
    if (p.revision && p.at >= newest && own(p.revision)) {
      newest = p.at;
      bandRevision = p.revision;
    }
  }
  const target = bandRevision ? bands.get(bandRevision)?.bands.get(group.check) : undefined;
  const band: Band | null = target ? target.worst : null;
  let pass = 0;
  let marginal = 0;
  let fail = 0;
  let firstPass = 0;
  let bandsDiffer = false;
  for (const p of points) {
    if (p.verdict === 'pass') pass++;
    else if (p.verdict === 'marginal') marginal++;
    else fail++;
    if (p.firstVerdict === 'pass') firstPass++;
    const ownBand = p.revision ? own(p.revision) : undefined;
    if (ownBand && band && (ownBand.min !== band.min || ownBand.max !== band.max)) bandsDiffer = true;
  }
  const capability = capabilityOf(spread, band);
  const n = points.length;
  return {
    check: group.check,
    n,
    pass,
    marginal,
    fail,
    mean: spread.mean,
    sd: spread.sd,
    min: spread.min,
    max: spread.max,
    cp: capability.cp,
    cpk: capability.cpk,
    plan: group.plan,
    unit: target?.unit ?? null,
    nominal: target?.nominal ?? null,
    band,
    bandRevision,
    bandsDiffer,
    firstPassYield: n > 0 ? firstPass / n : null,
    finalYield: n > 0 ? pass / n : null,
    status: capability.status,
    note: capability.note,
    outliers: outliersOf(group.check, points, spread.mean, spread.sd, band, own),
    points,
  };
}

/** A check's worst-case band per plan revision, looked up once per revision (a batch has few). */
function revisionBands(check: string, bands: ReadonlyMap<string, SnapshotBands>): (revision: string) => Band | undefined {
  const memo = new Map<string, Band | undefined>();
  let last: string | null = null;
  let lastBand: Band | undefined;
  return (revision) => {
    // Nearly every board of a batch shares one revision: answer that one without a lookup.
    if (revision === last) return lastBand;
    last = revision;
    if (memo.has(revision)) return (lastBand = memo.get(revision));
    const band = bands.get(revision)?.bands.get(check)?.worst;
    memo.set(revision, band);
    return (lastBand = band);
  };
}

/** Boards outside the band they were judged by, or more than 3σ from the batch mean. */
function outliersOf(
  check: string,
  points: readonly BatchPoint[],
  mean: number | null,
  sd: number | null,
  band: Band | null,
  own: (revision: string) => Band | undefined,
): Outlier[] {
  const out: Outlier[] = [];
  const hasSpread = mean !== null && sd !== null && sd > 0;
  for (const p of points) {
    const reasons: OutlierReason[] = [];
    const judged = (p.revision ? own(p.revision) : undefined) ?? band;
    if (judged && (p.value < judged.min || p.value > judged.max)) reasons.push('outside band');
    const z = hasSpread ? (p.value - mean) / sd : null;
    // Beyond 3σ: the usual control-chart limit (common practice, no source).
    if (z !== null && Math.abs(z) > 3) reasons.push('beyond 3σ');
    if (reasons.length > 0) out.push({ serial: p.serial, check, value: p.value, at: p.at, reasons, z });
  }
  return out.sort((a, b) => Math.abs(b.z ?? Infinity) - Math.abs(a.z ?? Infinity) || (a.serial < b.serial ? -1 : 1));
}

/** Plans by name, then checks in the order of the plan's targets, unknown ones last by name. */
function planOrder(bands: ReadonlyMap<string, SnapshotBands>): (a: BatchCheck, b: BatchCheck) => number {
  const rank = new Map<string, number>();
  for (const snapshot of bands.values()) {
    snapshot.order.forEach((check, i) => {
      const key = `${snapshot.plan}\u0000${check}`;
      if (!rank.has(key)) rank.set(key, i);
    });
  }
  return (a, b) => {
    const pa = a.plan ?? '';
    const pb = b.plan ?? '';
    if (pa !== pb) return pa < pb ? -1 : 1;
    const ra = rank.get(`${pa}\u0000${a.check}`) ?? Infinity;
    const rb = rank.get(`${pb}\u0000${b.check}`) ?? Infinity;
    if (ra !== rb) return ra - rb;
    return a.check < b.check ? -1 : a.check > b.check ? 1 : 0;
  };
}

/**
 * Weakest check first, for tables: lowest final yield, then lowest Cpk (checks
 * without a Cpk after those with one), then most fails.
 */
export function weakestFirst(a: BatchCheck, b: BatchCheck): number {
  const ya = a.finalYield ?? Infinity;
  const yb = b.finalYield ?? Infinity;
  if (ya !== yb) return ya - yb;
  const ca = a.cpk ?? Infinity;
  const cb = b.cpk ?? Infinity;
  if (ca !== cb) return ca - cb;
  if (a.fail !== b.fail) return b.fail - a.fail;
  return a.check < b.check ? -1 : a.check > b.check ? 1 : 0;
}
