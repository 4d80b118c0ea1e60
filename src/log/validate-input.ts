import { unitNoun } from '../units/unit.js';
import { LogInputError } from './errors.js';
import type { ReadingInput } from './types.js';

/** What starting a run needs (the `BenchLog.startRun` argument). */
export interface RunStart {
  readonly plan: string;
  readonly planHash: string;
  readonly planText: string;
  readonly operator: string;
}

const hashPattern = /^[0-9a-f]{64}$/;

export function checkRunStart(start: RunStart): void {
  if (typeof start.plan !== 'string' || start.plan === '') throw new LogInputError('a run needs the plan id');
  if (typeof start.planText !== 'string') throw new LogInputError('a run needs the plan text');
  if (!hashPattern.test(start.planHash)) throw new LogInputError(`${JSON.stringify(start.planHash)} is not a sha256 in hex`);
  if (typeof start.operator !== 'string') throw new LogInputError('a run needs the operator');
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
