import { LogInputError } from './errors.js';
import { newId } from './ids.js';
import type { BoardFile, CaptureRef, Reading, ReadingInput, Rework, Run, RunOutcome } from './types.js';
import { checkRunEnd, type RunStart } from './validate-input.js';

/**
 * The changes a store makes to one board, as pure functions from the board as
 * it is (read under the store's lock or row lock) to the board as it will be
 * and the result to hand back. Both stores (the folder and PostgreSQL) apply
 * the same functions, so the run and reading rules are one code.
 */
export interface BoardChange<T> {
  readonly board: BoardFile;
  readonly result: T;
  /** Check ids whose summary changed. */
  readonly touched?: readonly string[];
}

/** What `appendToOpenRun` did: the run used (started when none was open) and the saved reading. */
export interface AppendResult {
  readonly run: Run;
  readonly reading: Reading;
  readonly board: BoardFile;
  readonly startedRun: boolean;
}

export function emptyBoard(serial: string, schemaVersion: number): BoardFile {
  return { schemaVersion, serial, plan: null, runs: [], readings: [], rework: [], captures: [] };
}

export function readingFrom(input: ReadingInput, run: Run | undefined): Reading {
  const warnings = [...(input.warnings ?? [])];
  if (run?.ended) warnings.push(`recorded after its run ${run.id} ended (${run.ended})`);
  if (run && run.planHash !== input.planHash)
    warnings.push(`the plan changed since run ${run.id} started (run ${run.planHash.slice(0, 8)}, reading ${input.planHash.slice(0, 8)})`);
  return {
    id: newId('reading'),
    run: input.run,
    check: input.check,
    value: input.value,
    unit: input.unit,
    raw: input.raw,
    at: new Date().toISOString(),
    operator: input.operator,
    verdict: input.verdict,
    planHash: input.planHash,
    ...(input.capture === undefined ? {} : { capture: input.capture }),
    ...(warnings.length === 0 ? {} : { warnings }),
    ...(input.instrument === undefined ? {} : { instrument: { name: input.instrument.name, identity: input.instrument.identity } }),
  };
}

export function newRun(board: BoardFile, start: RunStart, now: string): { board: BoardFile; run: Run } {
  // One open run per board: starting another ends the open one as aborted.
  const runs = board.runs.map((r) => (r.ended === null ? { ...r, ended: now, outcome: 'aborted' as const } : r));
  const run: Run = {
    id: newId('run'),
    started: now,
    ended: null,
    operator: start.operator,
    outcome: 'in-progress',
    plan: start.plan,
    planHash: start.planHash,
  };
  return { board: { ...board, plan: start.plan, runs: [...runs, run] }, run };
}

export const startRunChange =
  (start: RunStart) =>
  (board: BoardFile): BoardChange<Run> => {
    const made = newRun(board, start, new Date().toISOString());
    return { board: made.board, result: made.run };
  };

export const endRunChange =
  (serial: string, runId: string, outcome: RunOutcome) =>
  (board: BoardFile): BoardChange<Run> => {
    checkRunEnd(outcome);
    const run = board.runs.find((r) => r.id === runId);
    if (!run) throw new LogInputError(`board ${serial} has no run ${runId}`);
    if (run.ended !== null) {
      if (run.outcome === outcome) return { board, result: run };
      throw new LogInputError(`run ${runId} of board ${serial} already ended ${run.outcome} at ${run.ended}`);
    }
    const ended: Run = { ...run, ended: new Date().toISOString(), outcome };
    return { board: { ...board, runs: board.runs.map((r) => (r.id === runId ? ended : r)) }, result: ended };
  };

export const appendReadingChange =
  (serial: string, input: ReadingInput) =>
  (board: BoardFile): BoardChange<Reading> => {
    const run = board.runs.find((r) => r.id === input.run);
    if (!run) throw new LogInputError(`board ${serial} has no run ${input.run}; start a run first`);
    const reading = readingFrom(input, run);
    return { board: { ...board, readings: [...board.readings, reading] }, result: reading, touched: [reading.check] };
  };

export const appendToOpenRunChange =
  (start: RunStart, input: Omit<ReadingInput, 'run'>, warningsFor?: (board: BoardFile, run: Run) => readonly string[]) =>
  (current: BoardFile): BoardChange<AppendResult> => {
    let board = current;
    let run = [...board.runs].reverse().find((r) => r.ended === null);
    const startedRun = run === undefined;
    if (!run) ({ board, run } = newRun(board, start, new Date().toISOString()));
    const extra = warningsFor?.(board, run) ?? [];
    const warnings = [...(input.warnings ?? []), ...extra];
    const reading = readingFrom({ ...input, run: run.id, ...(warnings.length ? { warnings } : {}) }, run);
    board = { ...board, readings: [...board.readings, reading] };
    return { board, result: { run, reading, board, startedRun }, touched: [reading.check] };
  };

export function checkRework(note: Omit<Rework, 'id' | 'at'>): void {
  for (const key of ['part', 'from', 'to', 'note', 'operator'] as const) {
    if (typeof note[key] !== 'string') throw new LogInputError(`a rework note needs ${key} as text`);
  }
  if (note.part.trim() === '') throw new LogInputError('a rework note needs the part, e.g. "osc.Ct"');
}

export const addReworkChange =
  (serial: string, note: Omit<Rework, 'id' | 'at'>) =>
  (board: BoardFile): BoardChange<Rework> => {
    if (note.run !== null && !board.runs.some((r) => r.id === note.run)) throw new LogInputError(`board ${serial} has no run ${note.run}`);
    const saved: Rework = { id: newId('rework'), at: new Date().toISOString(), ...note };
    return { board: { ...board, rework: [...board.rework, saved] }, result: saved };
  };

export const linkCaptureChange =
  (ref: CaptureRef) =>
  (board: BoardFile): BoardChange<undefined> => {
    const same = board.captures.some((c) => c.file === ref.file && c.check === ref.check && c.run === ref.run);
    return { board: same ? board : { ...board, captures: [...board.captures, ref] }, result: undefined };
  };

/** What merging one board into another added (`log copy`): by id, never twice. */
export interface MergeCounts {
  runs: number;
  readings: number;
  rework: number;
  captures: number;
}

/**
 * Merge a board copied from another log into this one: runs, readings and
 * rework notes by id, capture links by (file, check, run); a run known on both
 * sides takes the ended state when one side has it. Idempotent.
 */
export const mergeBoardChange =
  (source: BoardFile) =>
  (board: BoardFile): BoardChange<MergeCounts> => {
    const counts: MergeCounts = { runs: 0, readings: 0, rework: 0, captures: 0 };
    const runIds = new Map(board.runs.map((r, i) => [r.id, i] as const));
    const runs = [...board.runs];
    for (const r of source.runs) {
      const at = runIds.get(r.id);
      if (at === undefined) {
        runs.push(r);
        counts.runs++;
      } else if ((runs[at] as Run).ended === null && r.ended !== null) runs[at] = r;
    }
    const readingIds = new Set(board.readings.map((r) => r.id));
    const newReadings = source.readings.filter((r) => !readingIds.has(r.id));
    counts.readings = newReadings.length;
    const reworkIds = new Set(board.rework.map((r) => r.id));
    const newRework = source.rework.filter((r) => !reworkIds.has(r.id));
    counts.rework = newRework.length;
    const key = (c: CaptureRef) => `${c.file}\u0000${c.check}\u0000${c.run}`;
    const capKeys = new Set(board.captures.map(key));
    const newCaptures = source.captures.filter((c) => !capKeys.has(key(c)));
    counts.captures = newCaptures.length;
    const byTime = <T extends { at: string }>(a: T, b: T) => (a.at < b.at ? -1 : a.at > b.at ? 1 : 0);
    const next: BoardFile = {
      ...board,
      plan: board.plan ?? source.plan,
      runs: runs.sort((a, b) => (a.started < b.started ? -1 : a.started > b.started ? 1 : 0)),
      readings: [...board.readings, ...newReadings].sort(byTime),
      rework: [...board.rework, ...newRework].sort(byTime),
      captures: [...board.captures, ...newCaptures],
    };
    const changed = counts.runs + counts.readings + counts.rework + counts.captures > 0 || runs.some((r, i) => r !== board.runs[i]);
    return { board: changed ? next : board, result: counts, touched: [...new Set(newReadings.map((r) => r.check))] };
  };
