import type { Band, Verdict } from '../analysis/types.js';
import type { BoardSummary, CheckColumns, DamagedBoard, LogIndex } from '../analysis/records.js';
import type { SnapshotBands, SnapshotProblem } from './bands.js';
import type { BatchCheck, BatchFigures, BatchPoint, BatchProblem, Outlier, OutlierReason } from './batch-types.js';
import { capabilityOf } from './capability.js';
import { boardMatches, checkMatches, type BatchFilter } from './filter.js';
import { spreadOf } from './stats.js';

/**
 * One check's points, kept as parallel typed columns while boards are added (a
 * batch of 10,000 boards × 60 checks would otherwise build 600,000 point objects
 * that `batch --json` never prints, and their garbage); the point objects are
 * made when first asked for. Measured in bench/review.bench.ts.
 */
class Group {
  n = 0;
  values = new Float64Array(16);
  /** The latest reading's time in ms when its text is canonical ISO 8601, else NaN (compare the texts then). */
  atMs = new Float64Array(16);
  /** The time's text: a row of the columns (≥ 0), or −1 − k for `texts[k]`. */
  atRef = new Int32Array(16);
  /** Position of the point's board in the accumulator's board list. */
  board = new Int32Array(16);
  /** Verdict codes (0 pass, 1 marginal, 2 fail): latest | first << 2. */
  verdicts = new Uint8Array(16);
  readonly texts: string[] = [];

  constructor(
    readonly plan: string | null,
    readonly check: string,
  ) {}

  push(value: number, atMs: number, atRef: number | string, board: number, verdicts: number): void {
    if (this.n === this.values.length) this.#grow();
    const i = this.n++;
    this.values[i] = value;
    this.atMs[i] = atMs;
    if (typeof atRef === 'string') {
      this.texts.push(atRef);
      this.atRef[i] = -this.texts.length;
    } else this.atRef[i] = atRef;
    this.board[i] = board;
    this.verdicts[i] = verdicts;
  }

  #grow(): void {
    const size = this.values.length * 2;
    const grown = <T extends Float64Array | Int32Array | Uint8Array>(a: T, make: new (n: number) => T): T => {
      const b = new make(size);
      b.set(a);
      return b;
    };
    this.values = grown(this.values, Float64Array);
    this.atMs = grown(this.atMs, Float64Array);
    this.atRef = grown(this.atRef, Int32Array);
    this.board = grown(this.board, Int32Array);
    this.verdicts = grown(this.verdicts, Uint8Array);
  }
}

/** What the figures need of the boards added: the board and its plan revision's number (−1: none). */
interface BoardList {
  readonly boards: BoardSummary[];
  readonly revisionOf: number[];
  readonly revisions: string[];
}

const verdictNames: readonly Verdict[] = ['pass', 'marginal', 'fail'];
const codeOf = (v: Verdict): number => (v === 'pass' ? 0 : v === 'marginal' ? 1 : 2);

/** Feeds boards one at a time, so a long scan can yield to the screen between chunks. */
export interface BatchAccumulator {
  add(board: BoardSummary): void;
  finish(problems?: readonly SnapshotProblem[]): BatchFigures;
}

/**
 * Start a batch scan over index boards with the bands of their plan snapshots.
 * Boards whose file is damaged (`damaged`, from the index) are left out of every
 * figure, never counted from an older summary, and named in `problems` with why.
 * With `columns` (the index's `checkColumns`) a board's checks are read from
 * them instead of its `checks` objects; the figures are the same either way.
 */
export function batchAccumulator(
  bands: ReadonlyMap<string, SnapshotBands>,
  filter: BatchFilter = {},
  damaged: readonly DamagedBoard[] = [],
  columns?: CheckColumns,
): BatchAccumulator {
  const leftOut = new Set(damaged.map((d) => d.serial));
  const boardProblems: BatchProblem[] = damaged.map((d) => ({ serial: d.serial, message: `board ${d.serial} is left out of these figures: ${d.message}` }));
  const groups = new Map<string | null, Map<string, Group>>();
  const list: BoardList = { boards: [], revisionOf: [], revisions: [] };
  const revisionAt = new Map<string, number>();
  // Per plan, the group of each column check id (no string lookups per reading on the column path).
  const groupsByColumn = new Map<string | null, (Group | undefined)[]>();
  // Which column check ids the current board has: `seen[id] === boardNo`.
  const seen = new Uint32Array(columns?.checkIds.length ?? 0);
  const orderIds = new Map<SnapshotBands, Int32Array>();
  const latestAt = (row: number) => columns?.latestAt(row) ?? '';
  const checkNumber = columns?.checkIds;
  const isDateFiltered = filter.from !== undefined || filter.to !== undefined;
  let boardNo = 0;
  let boards = 0;
  let firstPassBoards = 0;
  let finalPassBoards = 0;
  let incomplete = 0;
  const groupOf = (plan: string | null, check: string): Group => {
    let byCheck = groups.get(plan);
    if (!byCheck) groups.set(plan, (byCheck = new Map()));
    let group = byCheck.get(check);
    if (!group) byCheck.set(check, (group = new Group(plan, check)));
    return group;
  };
  const inDates = (ms: number): boolean => {
    if (Number.isNaN(ms)) return false;
    if (filter.from !== undefined && ms < filter.from) return false;
    if (filter.to !== undefined && ms > filter.to) return false;
    return true;
  };
  /** The board's check rows through the columns; returns [any, firstOk, finalOk]. */
  const addColumns = (at: number, board: BoardSummary, c: CheckColumns, b: number): [boolean, boolean, boolean] => {
    boardNo++;
    let byColumn = groupsByColumn.get(board.plan);
    if (!byColumn) groupsByColumn.set(board.plan, (byColumn = []));
    let any = false;
    let firstOk = true;
    let finalOk = true;
    const end = c.rowStart[b + 1] ?? 0;
    for (let r = c.rowStart[b] ?? 0; r < end; r++) {
      const id = c.checkOf[r] ?? 0;
      seen[id] = boardNo;
      if (filter.check !== undefined && checkNumber?.[id] !== filter.check) continue;
      const ms = c.latestAtMs[r] ?? Number.NaN;
      if (isDateFiltered && !inDates(Number.isNaN(ms) ? Date.parse(latestAt(r)) : ms)) continue;
      const code = c.verdicts[r] ?? 0;
      const latest = code & 3;
      const first = code >> 2;
      any = true;
      if (first !== 0) firstOk = false;
      if (latest !== 0) finalOk = false;
      let group = byColumn[id];
      if (!group) {
        group = groupOf(board.plan, c.checkIds[id] ?? '');
        byColumn[id] = group;
      }
      group.push(c.latestValue[r] ?? Number.NaN, ms, r, at, code);
    }
    return [any, firstOk, finalOk];
  };
  const addObjects = (at: number, board: BoardSummary, checks: BoardSummary['checks']): [boolean, boolean, boolean] => {
    let any = false;
    let firstOk = true;
    let finalOk = true;
    for (const check in checks) {
      const summary = checks[check];
      if (!summary || !checkMatches(check, summary, filter)) continue;
      any = true;
      if (summary.first.verdict !== 'pass') firstOk = false;
      if (summary.latest.verdict !== 'pass') finalOk = false;
      const group = groupOf(board.plan, check);
      group.push(summary.latest.value, Number.NaN, summary.latest.at, at, codeOf(summary.latest.verdict) | (codeOf(summary.first.verdict) << 2));
    }
    return [any, firstOk, finalOk];
  };
  /** Whether the board lacks a reading of some check of its plan revision. */
  const lacksCheck = (own: SnapshotBands, checks: (() => BoardSummary['checks']) | null): boolean => {
    if (checks) {
      const all = checks();
      return own.order.some((c) => !(c in all));
    }
    let ids = orderIds.get(own);
    if (!ids) {
      const at = new Map((checkNumber ?? []).map((c, i) => [c, i]));
      orderIds.set(own, (ids = Int32Array.from(own.order, (c) => at.get(c) ?? -1)));
    }
    for (const id of ids) if (id < 0 || seen[id] !== boardNo) return true;
    return false;
  };
  return {
    add(board) {
      if (leftOut.has(board.serial) || !boardMatches(board, filter)) return;
      const b = columns ? columns.rowsOf(board.serial) : -1;
      // Read once: the store may hand out `checks` through a lazy getter.
      let checks: BoardSummary['checks'] | undefined;
      const at = list.boards.length;
      const [any, firstOk, finalOk] = columns && b >= 0 ? addColumns(at, board, columns, b) : addObjects(at, board, (checks = board.checks));
      if (!any) return;
      list.boards.push(board);
      let revision = -1;
      if (board.planHash) {
        revision = revisionAt.get(board.planHash) ?? list.revisions.length;
        if (revision === list.revisions.length) {
          list.revisions.push(board.planHash);
          revisionAt.set(board.planHash, revision);
        }
      }
      list.revisionOf.push(revision);
      boards++;
      if (firstOk) firstPassBoards++;
      if (finalOk) finalPassBoards++;
      const own = board.planHash ? bands.get(board.planHash) : undefined;
      if (own && filter.check === undefined && lacksCheck(own, checks ? () => checks as BoardSummary['checks'] : null)) incomplete++;
    },
    finish(problems = []) {
      const checks = [...groups.values()].flatMap((byCheck) => [...byCheck.values()].map((g) => checkFigures(g, list, bands, latestAt)));
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
  const acc = batchAccumulator(bands, filter, index.damaged, index.checkColumns);
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

/** The text of a point's time. */
function atText(group: Group, i: number, latestAt: (row: number) => string): string {
  const ref = group.atRef[i] ?? 0;
  return ref < 0 ? (group.texts[-1 - ref] ?? '') : latestAt(ref);
}

function checkFigures(group: Group, list: BoardList, bands: ReadonlyMap<string, SnapshotBands>, latestAt: (row: number) => string): BatchCheck {
  // Points stay in index order; the trend sorts the one check it draws.
  const n = group.n;
  const values = group.values.subarray(0, n);
  const spread = spreadOf(values);
  // The check's worst-case band per plan revision, looked up once per revision (a batch has few).
  const own = list.revisions.map((r) => bands.get(r)?.bands.get(group.check)?.worst);
  const revisionOf = (i: number) => list.revisionOf[group.board[i] ?? 0] ?? -1;
  // The band of the newest revision measured is the one the batch is judged by now.
  // ISO 8601 UTC times as the store writes them compare as strings in time order,
  // and as their milliseconds when both are in that canonical form.
  let bandRevision: string | null = null;
  let newestMs = Number.NaN;
  let newestText: string | null = '';
  for (let i = 0; i < n; i++) {
    const revision = revisionOf(i);
    if (revision < 0) continue;
    const ms = group.atMs[i] ?? Number.NaN;
    let isNewer: boolean;
    if (!Number.isNaN(ms) && !Number.isNaN(newestMs)) isNewer = ms >= newestMs;
    else {
      newestText ??= new Date(newestMs).toISOString();
      isNewer = atText(group, i, latestAt) >= newestText;
    }
    if (isNewer && own[revision]) {
      newestMs = ms;
      newestText = Number.isNaN(ms) ? atText(group, i, latestAt) : null;
      bandRevision = list.revisions[revision] ?? null;
    }
  }
  const target = bandRevision ? bands.get(bandRevision)?.bands.get(group.check) : undefined;
  const band: Band | null = target ? target.worst : null;
  // Which revisions judge by a band other than this one.
  const differs = own.map((b) => b !== undefined && band !== null && (b.min !== band.min || b.max !== band.max));
  let pass = 0;
  let marginal = 0;
  let fail = 0;
  let firstPass = 0;
  let bandsDiffer = false;
  for (let i = 0; i < n; i++) {
    const code = group.verdicts[i] ?? 0;
    const v = code & 3;
    if (v === 0) pass++;
    else if (v === 1) marginal++;
    else fail++;
    if (code >> 2 === 0) firstPass++;
    if (!bandsDiffer && differs[revisionOf(i)]) bandsDiffer = true;
  }
  const capability = capabilityOf(spread, band);
  let points: BatchPoint[] | undefined;
  const out: BatchCheck = {
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
    outliers: outliersOf(group, list, spread.mean, spread.sd, band, own, latestAt),
    points: [],
  };
  // Made on first use (the screens' histogram and trend), never for `batch --json`.
  return Object.defineProperty(out, 'points', {
    enumerable: true,
    get: () => (points ??= pointsOf(group, list, latestAt)),
  });
}

function pointsOf(group: Group, list: BoardList, latestAt: (row: number) => string): BatchPoint[] {
  const out: BatchPoint[] = [];
  for (let i = 0; i < group.n; i++) {
    const board = list.boards[group.board[i] ?? 0];
    const code = group.verdicts[i] ?? 0;
    out.push({
      serial: board?.serial ?? '',
      value: group.values[i] ?? Number.NaN,
      at: atText(group, i, latestAt),
      verdict: verdictNames[code & 3] ?? 'fail',
      firstVerdict: verdictNames[code >> 2] ?? 'fail',
      revision: board?.planHash ?? null,
    });
  }
  return out;
}

/** Boards outside the band they were judged by, or more than 3σ from the batch mean. */
function outliersOf(
  group: Group,
  list: BoardList,
  mean: number | null,
  sd: number | null,
  band: Band | null,
  own: readonly (Band | undefined)[],
  latestAt: (row: number) => string,
): Outlier[] {
  const out: Outlier[] = [];
  const hasSpread = mean !== null && sd !== null && sd > 0;
  for (let i = 0; i < group.n; i++) {
    const value = group.values[i] ?? Number.NaN;
    const b = group.board[i] ?? 0;
    const judged = own[list.revisionOf[b] ?? -1] ?? band;
    const isOutside = judged !== null && (value < judged.min || value > judged.max);
    const z = hasSpread ? (value - mean) / sd : null;
    // Beyond 3σ: the usual control-chart limit (common practice, no source).
    const isFar = z !== null && Math.abs(z) > 3;
    if (!isOutside && !isFar) continue;
    const reasons: OutlierReason[] = [];
    if (isOutside) reasons.push('outside band');
    if (isFar) reasons.push('beyond 3σ');
    out.push({ serial: list.boards[b]?.serial ?? '', check: group.check, value, at: atText(group, i, latestAt), reasons, z });
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
