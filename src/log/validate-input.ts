import { unitNoun } from '../units/unit.js';
import { sha256Hex } from './content-store.js';
import { LogInputError } from './errors.js';
import { validateSerial } from './serial.js';
import type { ReadingInput, RunOutcome } from './types.js';

/** What starting a run needs (the `BenchLog.startRun` argument). */
export interface RunStart {
  readonly plan: string;
  readonly planHash: string;
  readonly planText: string;
  readonly operator: string;
}

const hashPattern = /^[0-9a-f]{64}$/;

/** Refuse a board serial that cannot become a file name (both stores keep the folder's rule). */
export function checkSerial(serial: string): void {
  const problem = validateSerial(serial);
  if (problem) throw new LogInputError(problem);
}

/** Refuse a run start the log could not keep faithfully, the plan hash included (it must be the sha256 of the plan text). */
export function checkRunStart(start: RunStart): void {
  if (typeof start.plan !== 'string' || start.plan === '') throw new LogInputError('a run needs the plan id');
  if (typeof start.planText !== 'string') throw new LogInputError('a run needs the plan text');
  if (!hashPattern.test(start.planHash)) throw new LogInputError(`${JSON.stringify(start.planHash)} is not a sha256 in hex`);
  if (typeof start.operator !== 'string') throw new LogInputError('a run needs the operator');
  if (sha256Hex(start.planText) !== start.planHash) throw new LogInputError(`plan ${start.plan}: planHash is not the sha256 of planText`);
}

/** A run ends with an outcome; `in-progress` is not one. */
export function checkRunEnd(outcome: RunOutcome): void {
  if (outcome === 'in-progress') throw new LogInputError('a run cannot end as in-progress; use passed, failed, aborted or power-off');
}

/** Refuse a reading the log could not keep faithfully (a programming error upstream, not a user's). */
export function checkReadingInput(input: ReadingInput): void {
  if (typeof input.check !== 'string' || input.check === '') throw new LogInputError('a reading needs its check id');
  if (typeof input.value !== 'number' || Number.isNaN(input.value)) throw new LogInputError(`reading of ${input.check}: the value is not a number`);
  if (!(input.unit in unitNoun)) throw new LogInputError(`reading of ${input.check}: ${JSON.stringify(input.unit)} is not a unit`);
  if (input.verdict !== 'pass' && input.verdict !== 'marginal' && input.verdict !== 'fail')
    throw new LogInputError(`reading of ${input.check}: ${JSON.stringify(input.verdict)} is not a verdict`);
  if (!hashPattern.test(input.planHash)) throw new LogInputError(`reading of ${input.check}: ${JSON.stringify(input.planHash)} is not a sha256 in hex`);
  if (typeof input.raw !== 'string' || typeof input.operator !== 'string')
    throw new LogInputError(`reading of ${input.check}: raw text and operator are needed`);
}
