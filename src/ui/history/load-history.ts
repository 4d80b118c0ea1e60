import type { BenchLog, BoardFile } from '../../log/types.js';
import type { BandSource, SnapshotBands } from '../../review/bands.js';
import { boardHashes, timelineOf, type TimelineEntry } from '../../review/history.js';

/** Everything the history screen shows of one board. */
export interface HistoryData {
  readonly board: BoardFile;
  readonly timeline: readonly TimelineEntry[];
  /** Targets of each plan snapshot the board's readings were judged by. */
  readonly bands: ReadonlyMap<string, SnapshotBands>;
  /** Snapshots that could not be read, one line each. */
  readonly problems: readonly string[];
}

/**
 * One board file and the plan snapshots its readings refer to; nothing else is
 * read, so the screen opens quickly however large the log. Null when the board
 * has no file yet.
 */
export async function loadHistory(log: Pick<BenchLog, 'readBoard'>, serial: string, bandsSource: BandSource): Promise<HistoryData | null> {
  const board = await log.readBoard(serial);
  if (!board) return null;
  const bands = await bandsSource.load(boardHashes(board));
  return { board, timeline: timelineOf(board, bands), bands, problems: bandsSource.problems().map((p) => p.message) };
}
