import type { BoardHead } from './index-journal.js';
import type { BoardState } from './types.js';

/**
 * A board's line in `index.json`, packed as an array: the snapshot is read on
 * every opening of the bench screen, and at thousands of boards the parse time
 * follows its size. Plan hashes (64 characters, shared by a whole batch) are
 * kept once in a table and referred to by position.
 */
export type BoardRow = [
  plan: string | null,
  hash: number,
  state: BoardState,
  lastRunAt: string | null,
  runs: number,
  readings: number,
  rework: number,
  stamp: string,
];

export interface PackedBoards {
  readonly hashes: string[];
  readonly rows: Record<string, BoardRow>;
}

export function packBoards(boards: Iterable<[serial: string, head: BoardHead, stamp: string]>): PackedBoards {
  const hashes: string[] = [];
  const at = new Map<string, number>();
  const rows: Record<string, BoardRow> = {};
  for (const [serial, h, stamp] of boards) {
    let hash = -1;
    if (h.planHash !== null) {
      hash = at.get(h.planHash) ?? hashes.length;
      if (hash === hashes.length) {
        hashes.push(h.planHash);
        at.set(h.planHash, hash);
      }
    }
    rows[serial] = [h.plan, hash, h.state, h.lastRunAt, h.runs, h.readings, h.rework, stamp];
  }
  return { hashes, rows };
}

/** The boards of a packed snapshot, or null when a row is not of this shape (the index is then rebuilt). */
export function unpackBoards(packed: PackedBoards): [serial: string, head: BoardHead, stamp: string][] | null {
  const out: [string, BoardHead, string][] = [];
  for (const serial in packed.rows) {
    const r = packed.rows[serial];
    if (!Array.isArray(r) || r.length !== 8 || typeof r[7] !== 'string') return null;
    const planHash = r[1] >= 0 ? (packed.hashes[r[1]] ?? null) : null;
    out.push([serial, { serial, plan: r[0], planHash, state: r[2], lastRunAt: r[3], runs: r[4], readings: r[5], rework: r[6] }, r[7]]);
  }
  return out;
}
