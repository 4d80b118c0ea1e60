import type { LogIndex } from '../../log/types.js';
import type { BandSource } from '../../review/bands.js';
import { batchAccumulator, revisionsOf } from '../../review/batch.js';
import type { BatchFigures } from '../../review/batch-types.js';
import type { BatchFilter } from '../../review/filter.js';

/** Boards per chunk between screen updates. */
const chunk = 2000;

const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Batch figures over the in-memory index in chunks, yielding to the event loop
 * between them so the screen keeps drawing and can say how far the scan got.
 * Returns null when `isCancelled` turns true (a newer filter replaced this scan).
 */
export async function scanBatch(
  index: LogIndex,
  bands: BandSource,
  filter: BatchFilter,
  onProgress: (done: number, total: number) => void,
  isCancelled: () => boolean,
): Promise<BatchFigures | null> {
  const snapshots = await bands.load(revisionsOf(index, filter));
  const acc = batchAccumulator(snapshots, filter, index.damaged);
  const serials = Object.keys(index.boards);
  for (let i = 0; i < serials.length; i++) {
    const board = index.boards[serials[i] ?? ''];
    if (board) acc.add(board);
    if ((i + 1) % chunk === 0) {
      onProgress(i + 1, serials.length);
      await nextTurn();
      if (isCancelled()) return null;
    }
  }
  return acc.finish(bands.problems());
}
