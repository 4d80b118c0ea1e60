import { unitNoun } from '../units/unit.js';
import type { BoardFile } from './types.js';

// The shape of a board file (schema version 1), checked on every read. Written
// by hand rather than with a schema library: it runs on every append, over
// every reading of the board, and a writer process starts faster without one.
// Unknown keys are kept, not stripped, so nothing a later minor version wrote
// is lost when this one rewrites the file.

type Check = (v: unknown) => string | null;

const isoPattern = /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d(\.\d+)?Z$/;
const hashPattern = /^[0-9a-f]{64}$/;
const units = new Set(Object.keys(unitNoun));

const text: Check = (v) => (typeof v === 'string' ? null : 'expected text');
const nonEmpty: Check = (v) => (typeof v === 'string' && v !== '' ? null : 'expected non-empty text');
const iso: Check = (v) => (typeof v === 'string' && isoPattern.test(v) ? null : 'expected an ISO 8601 UTC time such as "2026-03-01T09:30:00.000Z"');
const isoOrNull: Check = (v) => (v === null ? null : iso(v));
const textOrNull: Check = (v) => (v === null || typeof v === 'string' ? null : 'expected text or null');
const hash: Check = (v) => (typeof v === 'string' && hashPattern.test(v) ? null : 'expected a sha256 in hex');
// Readings may be ±Infinity (an open circuit read as "OL"); JSON carries them as strings, decoded before this check.
const reading: Check = (v) => (typeof v === 'number' && !Number.isNaN(v) ? null : 'expected a number');
const oneOf =
  (...allowed: string[]): Check =>
  (v) =>
    typeof v === 'string' && allowed.includes(v) ? null : `expected one of ${allowed.map((a) => JSON.stringify(a)).join(', ')}`;
const unit: Check = (v) => (typeof v === 'string' && units.has(v) ? null : `expected a unit (${[...units].join(', ')})`);
const optional =
  (check: Check): Check =>
  (v) =>
    v === undefined ? null : check(v);
const instrumentRef: Check = (v) =>
  typeof v === 'object' &&
  v !== null &&
  typeof (v as { name?: unknown }).name === 'string' &&
  ['string', 'object'].includes(typeof (v as { identity?: unknown }).identity)
    ? null
    : 'expected {"name", "identity"}';
const texts: Check = (v) => (Array.isArray(v) && v.every((x) => typeof x === 'string') ? null : 'expected a list of texts');

type Shape = Readonly<Record<string, Check>>;

const readingShape: Shape = {
  id: nonEmpty,
  run: nonEmpty,
  check: nonEmpty,
  value: reading,
  unit,
  raw: text,
  at: iso,
  operator: text,
  verdict: oneOf('pass', 'marginal', 'fail'),
  planHash: hash,
  capture: optional(text),
  warnings: optional(texts),
  instrument: optional(instrumentRef),
};
const runShape: Shape = {
  id: nonEmpty,
  started: iso,
  ended: isoOrNull,
  operator: text,
  outcome: oneOf('in-progress', 'passed', 'failed', 'aborted', 'power-off'),
  plan: text,
  planHash: hash,
};
const reworkShape: Shape = { id: nonEmpty, at: iso, run: textOrNull, part: text, from: text, to: text, note: text, operator: text };
const captureShape: Shape = { file: nonEmpty, name: text, at: iso, check: textOrNull, run: textOrNull };

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function checkObject(v: unknown, shape: Shape, path: string): string | null {
  if (!isObject(v)) return `${path}: expected an object`;
  for (const key in shape) {
    const problem = (shape[key] as Check)(v[key]);
    if (problem) return `${path === '' ? '' : `${path}.`}${key}: ${v[key] === undefined ? 'missing; ' : ''}${problem}`;
  }
  return null;
}

function checkList(v: unknown, shape: Shape, path: string): string | null {
  if (!Array.isArray(v)) return `${path}: expected a list`;
  for (let i = 0; i < v.length; i++) {
    const problem = checkObject(v[i], shape, `${path}[${i}]`);
    if (problem) return problem;
  }
  return null;
}

/** Check a parsed board file; returns it typed, or the first problem as `path: what` text. */
export function checkBoardShape(data: unknown): { ok: true; board: BoardFile } | { ok: false; problem: string } {
  if (!isObject(data)) return { ok: false, problem: 'the top level: expected an object' };
  const problem =
    checkObject(data, { schemaVersion: (v) => (Number.isInteger(v) ? null : 'expected a whole number'), serial: nonEmpty, plan: textOrNull }, '') ??
    checkList(data.runs, runShape, 'runs') ??
    checkList(data.readings, readingShape, 'readings') ??
    checkList(data.rework, reworkShape, 'rework') ??
    checkList(data.captures, captureShape, 'captures');
  return problem ? { ok: false, problem } : { ok: true, board: data as unknown as BoardFile };
}
