import pg from 'pg';
import {
  addReworkChange,
  appendReadingChange,
  appendToOpenRunChange,
  type AppendResult,
  type BoardChange,
  checkRework,
  emptyBoard,
  endRunChange,
  linkCaptureChange,
  type MergeCounts,
  mergeBoardChange,
  startRunChange,
} from './board-changes.js';
import { captureExtension, sha256Hex } from './content-store.js';
import { LogInputError } from './errors.js';
import { indexSchemaVersion } from './index-store.js';
import { ensureSchema, pgSchemaVersion } from './pg-schema.js';
import { LogServerError, serverError } from './pg-errors.js';
import type { LogStore } from './store.js';
import { summarizeBoard } from './summary.js';
import {
  type BoardFile,
  boardSchemaVersion,
  type BoardState,
  type BoardSummary,
  type CaptureRef,
  type CheckSummary,
  type LogIndex,
  type Reading,
  type ReadingInput,
  type Rework,
  type Run,
  type RunOutcome,
} from './types.js';
import type { Verdict } from '../analysis/types.js';
import { checkReadingInput, checkRunEnd, checkRunStart, checkSerial, type RunStart } from './validate-input.js';

type Db = pg.ClientBase | pg.Pool;

type CheckRow = [string, string, number, Verdict, string, number, Verdict, string, number];
type BoardRow = [string, string | null, string | null, BoardState, string | null, number, number, number];

/** A board as the folder log would hold it, read from the tables in write order. */
async function loadBoard(db: Db, serial: string): Promise<BoardFile | null> {
  const board = await db.query<{ plan: string | null }>('SELECT plan FROM boards WHERE serial = $1', [serial]);
  if (board.rowCount === 0) return null;
  // One after another: a client inside a transaction takes one query at a time.
  const runs = await db.query('SELECT id, started, ended, operator, outcome, plan, plan_hash FROM runs WHERE serial = $1 ORDER BY seq', [serial]);
  const readings = await db.query(
    'SELECT id, run, check_id, value, unit, raw, at, operator, verdict, plan_hash, capture, warnings, instrument FROM readings WHERE serial = $1 ORDER BY seq',
    [serial],
  );
  const rework = await db.query('SELECT id, at, run, part, from_value, to_value, note, operator FROM rework WHERE serial = $1 ORDER BY seq', [serial]);
  const captures = await db.query('SELECT file, name, at, check_id, run FROM board_captures WHERE serial = $1 ORDER BY seq', [serial]);
  return {
    schemaVersion: boardSchemaVersion,
    serial,
    plan: board.rows[0]?.plan ?? null,
    runs: runs.rows.map(
      (r): Run => ({ id: r.id, started: r.started, ended: r.ended, operator: r.operator, outcome: r.outcome, plan: r.plan, planHash: r.plan_hash }),
    ),
    readings: readings.rows.map(
      (r): Reading => ({
        id: r.id,
        run: r.run,
        check: r.check_id,
        value: Number(r.value),
        unit: r.unit,
        raw: r.raw,
        at: r.at,
        operator: r.operator,
        verdict: r.verdict,
        planHash: r.plan_hash,
        ...(r.capture === null ? {} : { capture: r.capture }),
        ...(r.warnings === null ? {} : { warnings: r.warnings }),
        ...(r.instrument === null ? {} : { instrument: r.instrument }),
      }),
    ),
    rework: rework.rows.map(
      (w): Rework => ({ id: w.id, at: w.at, run: w.run, part: w.part, from: w.from_value, to: w.to_value, note: w.note, operator: w.operator }),
    ),
    captures: captures.rows.map((c): CaptureRef => ({ file: c.file, name: c.name, at: c.at, check: c.check_id, run: c.run })),
  };
}

/** Write what `next` adds to or changes in `prev` (runs ended, rows added); rows are never deleted. */
async function writeDelta(db: Db, prev: BoardFile, next: BoardFile): Promise<void> {
  if (next.plan !== prev.plan) await db.query('UPDATE boards SET plan = $2 WHERE serial = $1', [next.serial, next.plan]);
  const oldRuns = new Map(prev.runs.map((r) => [r.id, r] as const));
  for (const r of next.runs) {
    const old = oldRuns.get(r.id);
    if (!old) {
      await db.query('INSERT INTO runs (id, serial, started, ended, operator, outcome, plan, plan_hash) VALUES ($1,$2,$3,$4,$5,$6,$7,$8)', [
        r.id,
        next.serial,
        r.started,
        r.ended,
        r.operator,
        r.outcome,
        r.plan,
        r.planHash,
      ]);
    } else if (old.ended !== r.ended || old.outcome !== r.outcome) {
      await db.query('UPDATE runs SET ended = $2, outcome = $3 WHERE id = $1', [r.id, r.ended, r.outcome]);
    }
  }
  const oldReadings = new Set(prev.readings.map((r) => r.id));
  for (const r of next.readings) {
    if (oldReadings.has(r.id)) continue;
    await db.query(
      'INSERT INTO readings (id, serial, run, check_id, value, unit, raw, at, operator, verdict, plan_hash, capture, warnings, instrument) VALUES ($1,$2,$3,$4,$5,$6,$7,$8,$9,$10,$11,$12,$13,$14)',
      [
        r.id,
        next.serial,
        r.run,
        r.check,
        r.value,
        r.unit,
        r.raw,
        r.at,
        r.operator,
        r.verdict,
        r.planHash,
        r.capture ?? null,
        r.warnings === undefined ? null : JSON.stringify(r.warnings),
        r.instrument === undefined ? null : JSON.stringify(r.instrument),
      ],
    );
  }
  const oldRework = new Set(prev.rework.map((w) => w.id));
  for (const w of next.rework) {
    if (oldRework.has(w.id)) continue;
    await db.query('INSERT INTO rework (id, serial, at, run, part, from_value, to_value, note, operator) VALUES ($1,$2,$3,$4,$5,$6,$7,$8,$9)', [
      w.id,
      next.serial,
      w.at,
      w.run,
      w.part,
      w.from,
      w.to,
      w.note,
      w.operator,
    ]);
  }
  const key = (c: CaptureRef) => `${c.file}\u0000${c.check}\u0000${c.run}`;
  const oldCaptures = new Set(prev.captures.map(key));
  for (const c of next.captures) {
    if (oldCaptures.has(key(c))) continue;
    await db.query('INSERT INTO board_captures (serial, file, name, at, check_id, run) VALUES ($1,$2,$3,$4,$5,$6)', [
      next.serial,
      c.file,
      c.name,
      c.at,
      c.check,
      c.run,
    ]);
  }
}

/** Keep a plan snapshot by its hash (kept once: the hash names the text). */
async function putPlanSnapshot(db: Db, hash: string, text: string): Promise<void> {
  await db.query('INSERT INTO plan_snapshots (hash, text) VALUES ($1, $2) ON CONFLICT (hash) DO NOTHING', [hash, text]);
}

/** Keep a capture's bytes under its content name (kept once). */
async function putCapture(db: Db, file: string, bytes: Uint8Array): Promise<void> {
  await db.query('INSERT INTO captures (file, bytes) VALUES ($1, $2) ON CONFLICT (file) DO NOTHING', [file, Buffer.from(bytes)]);
}

/** Keep the review summary of the board in step, in the same transaction. */
async function writeSummary(db: Db, board: BoardFile, touched: readonly string[] | 'all'): Promise<void> {
  const s = summarizeBoard(board);
  await db.query(
    `INSERT INTO board_summary (serial, plan, plan_hash, state, last_run_at, runs, readings, rework) VALUES ($1,$2,$3,$4,$5,$6,$7,$8)
     ON CONFLICT (serial) DO UPDATE SET plan = EXCLUDED.plan, plan_hash = EXCLUDED.plan_hash, state = EXCLUDED.state, last_run_at = EXCLUDED.last_run_at, runs = EXCLUDED.runs, readings = EXCLUDED.readings, rework = EXCLUDED.rework`,
    [s.serial, s.plan, s.planHash, s.state, s.lastRunAt, s.runs, s.readings, s.rework],
  );
  const checks = touched === 'all' ? Object.keys(s.checks) : touched;
  for (const check of checks) {
    const c = s.checks[check];
    if (!c) continue;
    await db.query(
      `INSERT INTO check_summary (serial, check_id, first_value, first_verdict, first_at, latest_value, latest_verdict, latest_at, count) VALUES ($1,$2,$3,$4,$5,$6,$7,$8,$9)
       ON CONFLICT (serial, check_id) DO UPDATE SET first_value = EXCLUDED.first_value, first_verdict = EXCLUDED.first_verdict, first_at = EXCLUDED.first_at,
         latest_value = EXCLUDED.latest_value, latest_verdict = EXCLUDED.latest_verdict, latest_at = EXCLUDED.latest_at, count = EXCLUDED.count`,
      [s.serial, check, c.first.value, c.first.verdict, c.first.at, c.latest.value, c.latest.verdict, c.latest.at, c.count],
    );
  }
}

/**
 * The bench log in PostgreSQL (DESIGN §6): the same board model and the same
 * change rules as the folder log (`board-changes.ts`), each write one
 * transaction holding the board's row lock, so concurrent benches lose and
 * duplicate nothing, and a write is acknowledged only after its commit.
 */
export class PgStore implements LogStore {
  readonly #pool: pg.Pool;
  readonly #tooNew: string | null;

  constructor(
    pool: pg.Pool,
    readonly dir: string,
    schemaVersion: number,
  ) {
    this.#pool = pool;
    this.#tooNew =
      schemaVersion > pgSchemaVersion
        ? `log ${dir}: its schema is version ${schemaVersion}, newer than this probebook writes (${pgSchemaVersion}); upgrade probebook before recording into it`
        : null;
  }

  boardPath(serial: string): string {
    return `${this.dir} board ${serial}`;
  }

  async #read<T>(work: () => Promise<T>): Promise<T> {
    try {
      return await work();
    } catch (error) {
      if (error instanceof LogInputError) throw error;
      throw serverError(error, this.dir);
    }
  }

  /** One transaction: lock the board's row, read it, apply the change, write the delta and the summary, commit. */
  async #update<T>(serial: string, change: (board: BoardFile) => BoardChange<T>, before?: (db: pg.ClientBase) => Promise<void>, touchAll = false): Promise<T> {
    checkSerial(serial);
    if (this.#tooNew) throw new LogServerError(this.#tooNew);
    let client: pg.PoolClient;
    try {
      client = await this.#pool.connect();
    } catch (error) {
      throw serverError(error, this.dir);
    }
    // A connection lost while checked out is reported by the query that fails; the event itself must not crash the process.
    const ignore = () => undefined;
    client.on('error', ignore);
    let isCommitting = false;
    let broken = false;
    try {
      await client.query('BEGIN');
      await before?.(client);
      await client.query('INSERT INTO boards (serial) VALUES ($1) ON CONFLICT (serial) DO NOTHING', [serial]);
      await client.query('SELECT 1 FROM boards WHERE serial = $1 FOR UPDATE', [serial]);
      const prev = (await loadBoard(client, serial)) ?? emptyBoard(serial, boardSchemaVersion);
      const next = change(prev);
      if (next.board !== prev) {
        await writeDelta(client, prev, next.board);
        await writeSummary(client, next.board, touchAll ? 'all' : (next.touched ?? []));
      }
      isCommitting = true;
      await client.query('COMMIT');
      return next.result;
    } catch (error) {
      broken = !(error instanceof LogInputError);
      if (!isCommitting) await client.query('ROLLBACK').catch(() => undefined);
      if (error instanceof LogInputError) throw error;
      throw serverError(error, this.dir, isCommitting);
    } finally {
      client.off('error', ignore);
      client.release(broken);
    }
  }

  async #savePlan(db: pg.ClientBase, start: RunStart): Promise<void> {
    await putPlanSnapshot(db, start.planHash, start.planText);
  }

  /** A database answers `readIndex` in one query; there is no cheaper head to read first. */
  readIndexHead(): null {
    return null;
  }

  readIndex(): Promise<LogIndex> {
    return this.#read(async () => {
      // Rows as arrays, not objects (the driver's row objects cost most of the fetch at 10⁵ boards;
      // measured with bench/pg.bench.ts). ±Infinity arrives as a float8 the driver parses.
      const boards = await this.#pool.query<BoardRow>({
        text: 'SELECT serial, plan, plan_hash, state, last_run_at, runs, readings, rework FROM board_summary',
        rowMode: 'array',
      });
      const checks = await this.#pool.query<CheckRow>({
        text: 'SELECT serial, check_id, first_value, first_verdict, first_at, latest_value, latest_verdict, latest_at, count FROM check_summary',
        rowMode: 'array',
      });
      const byBoard = new Map<string, Record<string, CheckSummary>>();
      for (const c of checks.rows) {
        let m = byBoard.get(c[0]);
        if (!m) byBoard.set(c[0], (m = {}));
        m[c[1]] = { first: { value: c[2], verdict: c[3], at: c[4] }, latest: { value: c[5], verdict: c[6], at: c[7] }, count: c[8] };
      }
      const out: Record<string, BoardSummary> = {};
      for (const b of boards.rows) {
        out[b[0]] = {
          serial: b[0],
          plan: b[1],
          planHash: b[2],
          state: b[3],
          lastRunAt: b[4],
          runs: b[5],
          readings: b[6],
          rework: b[7],
          checks: byBoard.get(b[0]) ?? {},
        };
      }
      return { schemaVersion: indexSchemaVersion, boards: out, damaged: [] };
    });
  }

  async readBoard(serial: string): Promise<BoardFile | null> {
    checkSerial(serial);
    return this.#read(() => loadBoard(this.#pool, serial));
  }

  /** Every board serial in the log (for `log copy`). */
  listSerials(): Promise<string[]> {
    return this.#read(async () => (await this.#pool.query<{ serial: string }>('SELECT serial FROM boards ORDER BY serial')).rows.map((r) => r.serial));
  }

  async startRun(serial: string, start: RunStart): Promise<Run> {
    checkRunStart(start);
    return this.#update(serial, startRunChange(start), (db) => this.#savePlan(db, start));
  }

  async endRun(serial: string, runId: string, outcome: RunOutcome): Promise<Run> {
    checkRunEnd(outcome);
    return this.#update(serial, endRunChange(serial, runId, outcome));
  }

  async appendReading(serial: string, input: ReadingInput): Promise<Reading> {
    checkReadingInput(input);
    return this.#update(serial, appendReadingChange(serial, input), async (db) => {
      const kept = await db.query('SELECT 1 FROM plan_snapshots WHERE hash = $1', [input.planHash]);
      if (kept.rowCount === 0) throw new LogInputError(`plan ${input.planHash.slice(0, 12)}… is not in the log; start a run with that plan first`);
    });
  }

  async appendToOpenRun(
    serial: string,
    start: RunStart,
    input: Omit<ReadingInput, 'run'>,
    warningsFor?: (board: BoardFile, run: Run) => readonly string[],
  ): Promise<AppendResult> {
    checkRunStart(start);
    checkReadingInput({ ...input, run: 'pending' });
    return this.#update(serial, appendToOpenRunChange(start, input, warningsFor), (db) => this.#savePlan(db, start));
  }

  async addRework(serial: string, note: Omit<Rework, 'id' | 'at'>): Promise<Rework> {
    checkRework(note);
    return this.#update(serial, addReworkChange(serial, note));
  }

  /** Merge a board copied from another log (`log copy`); idempotent. Plans and captures go first. */
  async mergeBoard(source: BoardFile, plans: ReadonlyMap<string, string>, captures: ReadonlyMap<string, Uint8Array>): Promise<MergeCounts> {
    return this.#update(
      source.serial,
      mergeBoardChange(source),
      async (db) => {
        for (const [hash, text] of plans) await putPlanSnapshot(db, hash, text);
        for (const [file, bytes] of captures) await putCapture(db, file, bytes);
      },
      true,
    );
  }

  readPlanSnapshot(hash: string): Promise<string | null> {
    return this.#read(async () => (await this.#pool.query<{ text: string }>('SELECT text FROM plan_snapshots WHERE hash = $1', [hash])).rows[0]?.text ?? null);
  }

  async saveCapture(bytes: Uint8Array, name: string): Promise<{ file: string }> {
    if (this.#tooNew) throw new LogServerError(this.#tooNew);
    const file = `${sha256Hex(bytes)}.${captureExtension(name)}`;
    await this.#read(() => putCapture(this.#pool, file, bytes));
    return { file };
  }

  readCapture(file: string): Promise<Uint8Array | null> {
    return this.#read(async () => {
      const row = (await this.#pool.query<{ bytes: Buffer }>('SELECT bytes FROM captures WHERE file = $1', [file])).rows[0];
      return row ? new Uint8Array(row.bytes) : null;
    });
  }

  async linkCapture(serial: string, ref: CaptureRef): Promise<void> {
    await this.#update(serial, linkCaptureChange(ref), async (db) => {
      const kept = await db.query('SELECT 1 FROM captures WHERE file = $1', [ref.file]);
      if (kept.rowCount === 0) throw new LogInputError(`capture ${ref.file} is not in the log; save it first`);
    });
  }

  async close(): Promise<void> {
    await this.#pool.end();
  }
}

/** Connect, create or check the schema, and hand back the store. */
export async function openPgLog(url: string, shown: string): Promise<PgStore> {
  const pool = new pg.Pool({
    connectionString: url,
    max: 4,
    allowExitOnIdle: true,
    connectionTimeoutMillis: 5000,
    query_timeout: 30_000,
    application_name: 'probebook',
  });
  // An idle client whose server went away must not crash the process.
  pool.on('error', () => undefined);
  let client: pg.PoolClient;
  try {
    client = await pool.connect();
  } catch (error) {
    await pool.end().catch(() => undefined);
    throw serverError(error, shown);
  }
  try {
    const version = await ensureSchema(client);
    client.release();
    return new PgStore(pool, shown, version);
  } catch (error) {
    client.release(true);
    await pool.end().catch(() => undefined);
    throw serverError(error, shown);
  }
}
