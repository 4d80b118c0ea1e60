import { z } from 'zod';
import { unitNoun } from '../units/unit.js';
import type { BoardFile } from './types.js';

// Shapes of a board file (schema version 1), checked on every read. Objects are
// loose: a key this version does not know is kept, not stripped, so nothing a
// later minor version wrote is lost when this one rewrites the file.

const iso = z.string().regex(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d(\.\d+)?Z$/, 'expected an ISO 8601 UTC time such as "2026-03-01T09:30:00.000Z"');
const hash = z.string().regex(/^[0-9a-f]{64}$/, 'expected a sha256 in hex');
// Readings may be ±Infinity (an open circuit read as "OL"); JSON carries them as strings, decoded before this check.
const reading = z.custom<number>((v) => typeof v === 'number' && !Number.isNaN(v), 'expected a number');
const units = Object.keys(unitNoun) as [keyof typeof unitNoun, ...(keyof typeof unitNoun)[]];
const verdict = z.enum(['pass', 'marginal', 'fail']);

const readingSchema = z.looseObject({
  id: z.string().min(1),
  run: z.string().min(1),
  check: z.string().min(1),
  value: reading,
  unit: z.enum(units),
  raw: z.string(),
  at: iso,
  operator: z.string(),
  verdict,
  planHash: hash,
  capture: z.string().optional(),
  warnings: z.array(z.string()).optional(),
});

const runSchema = z.looseObject({
  id: z.string().min(1),
  started: iso,
  ended: iso.nullable(),
  operator: z.string(),
  outcome: z.enum(['in-progress', 'passed', 'failed', 'aborted', 'power-off']),
  plan: z.string(),
  planHash: hash,
});

const reworkSchema = z.looseObject({
  id: z.string().min(1),
  at: iso,
  run: z.string().nullable(),
  part: z.string(),
  from: z.string(),
  to: z.string(),
  note: z.string(),
  operator: z.string(),
});

const captureSchema = z.looseObject({
  file: z.string().min(1),
  name: z.string(),
  at: iso,
  check: z.string().nullable(),
  run: z.string().nullable(),
});

export const boardSchema = z.looseObject({
  schemaVersion: z.number().int(),
  serial: z.string().min(1),
  plan: z.string().nullable(),
  runs: z.array(runSchema),
  readings: z.array(readingSchema),
  rework: z.array(reworkSchema),
  captures: z.array(captureSchema),
});

/** Check a parsed board file; returns it typed, or the first problem as `path: what` text. */
export function checkBoardShape(data: unknown): { ok: true; board: BoardFile } | { ok: false; problem: string } {
  const result = boardSchema.safeParse(data);
  if (result.success) return { ok: true, board: result.data as BoardFile };
  const issue = result.error.issues[0];
  if (!issue) return { ok: false, problem: 'not a board file' };
  const path = issue.path.reduce<string>((text, key) => (typeof key === 'number' ? `${text}[${key}]` : text === '' ? String(key) : `${text}.${String(key)}`), '');
  return { ok: false, problem: `${path === '' ? 'the top level' : path}: ${issue.message}` };
}
