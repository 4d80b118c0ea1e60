import { describe, expect, test } from 'vitest';
import { boardState } from '../../src/log/summary.js';
import type { Reading, Rework, Run } from '../../src/log/types.js';

const hash = 'a'.repeat(64);
const run = (outcome: Run['outcome'], started: string, ended: string | null): Run => ({
  id: `u-${started}`,
  started,
  ended,
  operator: 'ann',
  outcome,
  plan: 'p',
  planHash: hash,
});
const one: Reading = {
  id: 'r-1',
  run: 'u-1',
  check: 'a',
  value: 1,
  unit: 'V',
  raw: '1',
  at: '2026-01-01T10:00:00.000Z',
  operator: 'ann',
  verdict: 'pass',
  planHash: hash,
};
const note = (at: string): Rework => ({ id: 'w-1', at, run: null, part: 'x.R', from: '1k', to: '2k', note: '', operator: 'ann' });

describe('boardState (documented in src/log/summary.ts)', () => {
  test.each<[string, Run[], Reading[], Rework[], string]>([
    ['no runs, no readings', [], [], [], 'untouched'],
    ['an open run', [run('in-progress', '2026-01-01T09:00:00.000Z', null)], [], [], 'in-progress'],
    ['a passed run', [run('passed', '2026-01-01T09:00:00.000Z', '2026-01-01T11:00:00.000Z')], [one], [], 'passed'],
    ['a failed run', [run('failed', '2026-01-01T09:00:00.000Z', '2026-01-01T11:00:00.000Z')], [one], [], 'failed'],
    ['power off counts as failed', [run('power-off', '2026-01-01T09:00:00.000Z', '2026-01-01T11:00:00.000Z')], [one], [], 'failed'],
    ['an aborted run is unfinished', [run('aborted', '2026-01-01T09:00:00.000Z', '2026-01-01T11:00:00.000Z')], [one], [], 'in-progress'],
    [
      'rework after the failed run',
      [run('failed', '2026-01-01T09:00:00.000Z', '2026-01-01T11:00:00.000Z')],
      [one],
      [note('2026-01-01T12:00:00.000Z')],
      'reworked',
    ],
    [
      'rework before the failed run ended',
      [run('failed', '2026-01-01T09:00:00.000Z', '2026-01-01T11:00:00.000Z')],
      [one],
      [note('2026-01-01T10:30:00.000Z')],
      'failed',
    ],
    ['an ended run without readings', [run('aborted', '2026-01-01T09:00:00.000Z', '2026-01-01T09:01:00.000Z')], [], [], 'untouched'],
  ])('%s → %s', (_name, runs, readings, rework, state) => {
    expect(boardState({ runs, readings, rework })).toBe(state);
  });
});
