import { closeSync, existsSync, openSync, readSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { type CsvLayout, type CsvPart, CsvParser } from './csv-parser.js';
import type { ReadOptions } from './types.js';

/**
 * A large CSV capture read by two threads. The rest of the file after its head
 * is cut into blocks at line starts; this thread takes blocks from the front,
 * a worker thread from the back, each claiming a block before reading it, so
 * neither waits for the other however busy the machine is. The worker's rows
 * are then joined in file order (`CsvParser.absorb`); a block the worker could
 * not read (a bad row) or that does not join (time not increasing) is read
 * here, so every message names its true line. The numbers are the ones one
 * thread reads: the same parser over the same bytes.
 */

const LF = 10;
const chunkBytes = 1024 * 1024;
/** Bytes per block: small enough to balance the threads, large enough that a block costs far more than its claim and its message. */
const blockBytes = 4 * 1024 * 1024;
/** Longest line looked for at a block boundary; a file with longer lines is read by one thread. */
const boundaryWindow = 64 * 1024;

/** Line starts cutting [from, size) into blocks of about `block` bytes: [from, …, size]; undefined when a line is too long to find its end. */
export function blockBounds(fd: number, from: number, size: number, block = blockBytes): number[] | undefined {
  const bounds = [from];
  const window = new Uint8Array(boundaryWindow);
  for (let at = from + block; at < size; at = (bounds[bounds.length - 1] as number) + block) {
    const got = readSync(fd, window, 0, Math.min(window.length, size - at), at);
    const nl = window.subarray(0, got).indexOf(LF);
    if (nl < 0) return undefined;
    if (at + nl + 1 >= size) break;
    bounds.push(at + nl + 1);
  }
  bounds.push(size);
  return bounds;
}

/** Push the bytes [from, to) of a file into a parser, a chunk at a time. */
export function pushRange(fd: number, parser: CsvParser, from: number, to: number, buffer: Uint8Array = new Uint8Array(chunkBytes)): void {
  for (let at = from; at < to; ) {
    const got = readSync(fd, buffer, 0, Math.min(buffer.length, to - at), at);
    if (got === 0) break;
    parser.push(buffer.subarray(0, got));
    at += got;
  }
}

/** Read the rows of [from, to) of a file, `from` a line start, with a parser of its own. */
export function readCsvPart(fd: number, from: number, to: number, layout: CsvLayout, options: ReadOptions, buffer?: Uint8Array): CsvPart {
  const parser = CsvParser.forPart(options, layout, to - from);
  pushRange(fd, parser, from, to, buffer);
  return parser.part();
}

/** How the rest is cut and shared; tests set these, the command takes the defaults. */
export interface TwoThreadTuning {
  /** Bytes per block. @default 4 MiB */
  readonly blockBytes?: number;
  /** Blocks at the end kept for the worker whenever it starts (so a test knows it ran). @default 0 */
  readonly reserve?: number;
}

/** Slot values in `claims`: free, taken by a thread, kept for the worker. */
const free = 0;
const reserved = 2;

/** What the worker is given. `claims` is shared: a block is read by whoever sets its slot from free to taken. */
export interface TwoThreadRequest {
  readonly path: string;
  readonly bounds: readonly number[];
  readonly claims: Int32Array;
  readonly layout: CsvLayout;
  readonly options: ReadOptions;
}

/** The worker's side: blocks from the back until one is already taken. Runs in the worker thread. */
export function workerSide(request: TwoThreadRequest, post: (message: BlockMessage, transfer?: ArrayBuffer[]) => void): void {
  const { bounds, claims } = request;
  const fd = openSync(request.path, 'r');
  const buffer = new Uint8Array(chunkBytes);
  try {
    for (let k = bounds.length - 2; k >= 1; k--) {
      const was = Atomics.compareExchange(claims, k, free, 1);
      if (was !== free && was !== reserved) break;
      try {
        const part = readCsvPart(fd, bounds[k] as number, bounds[k + 1] as number, request.layout, request.options, buffer);
        post({ type: 'part', index: k, part }, [...new Set(part.columns.map((c) => c.buffer as ArrayBuffer))]);
      } catch {
        // Read again by the other thread, which names the line.
        post({ type: 'failed', index: k });
      }
    }
  } finally {
    closeSync(fd);
    post({ type: 'end' });
  }
}

export type BlockMessage = { type: 'part'; index: number; part: CsvPart } | { type: 'failed'; index: number } | { type: 'end' };

/**
 * The worker script beside this module: `csv-part-worker.js` next to the
 * bundle (scripts/build.mjs writes it to dist/), or the TypeScript source
 * under tsx (development, tests).
 */
function workerScript(): { script: URL | string; isEval: boolean } | null {
  const js = new URL('./csv-part-worker.js', import.meta.url);
  if (existsSync(fileURLToPath(js))) return { script: js, isEval: false };
  const ts = new URL('./csv-part-worker.ts', import.meta.url);
  if (!existsSync(fileURLToPath(ts))) return null;
  // Node 20 does not pass `--import` hooks on to worker threads: the worker registers tsx itself, found from here.
  const local = new URL('../../node_modules/tsx/dist/esm/api/index.mjs', import.meta.url);
  const api = existsSync(fileURLToPath(local)) ? local.href : 'tsx/esm/api';
  const code = `import(${JSON.stringify(api)}).then((api) => { api.register(); return import(${JSON.stringify(ts.href)}); }).catch(() => { require('node:worker_threads').parentPort.postMessage({ type: 'end' }); });`;
  return { script: code, isEval: true };
}

/**
 * Read the rest of a CSV file, from `from` (where `parser`, which has read the
 * head, stands) to `size`, with a worker thread. −1, with nothing read, when
 * it does not apply (no worker script, lines too long to cut, too little left);
 * once it has started it reads everything, on this thread where the worker
 * could not. Returns how many of the worker's blocks were joined.
 */
export async function readRestTwoThreads(
  fd: number,
  path: string,
  parser: CsvParser,
  from: number,
  size: number,
  options: ReadOptions,
  tuning: TwoThreadTuning = {},
): Promise<number> {
  const layout = parser.layout;
  const start = workerScript();
  if (!layout || layout.isCrOnly || !start) return -1;
  const bounds = blockBounds(fd, from, size, tuning.blockBytes);
  // Three blocks at least: the first is always this thread's (it finishes the line the head cut).
  if (!bounds || bounds.length < 4) return -1;
  const blocks = bounds.length - 1;
  const claims = new Int32Array(new SharedArrayBuffer(4 * blocks));
  claims[0] = 1;
  for (let r = 0; r < Math.min(tuning.reserve ?? 0, blocks - 1); r++) claims[blocks - 1 - r] = reserved;
  const parts = new Map<number, CsvPart>();
  const request: TwoThreadRequest = { path, bounds, claims, layout, options };
  let worker: Worker | undefined;
  const ended = new Promise<void>((resolve) => {
    try {
      worker = new Worker(start.script, { eval: start.isEval, workerData: request });
    } catch {
      resolve();
      return;
    }
    worker.on('message', (m: BlockMessage) => {
      if (m.type === 'part') parts.set(m.index, m.part);
      else if (m.type === 'end') resolve();
    });
    worker.on('error', () => resolve());
    worker.on('exit', () => resolve());
  });
  try {
    // This thread's blocks, from the front, until one is the worker's.
    const buffer = new Uint8Array(chunkBytes);
    let k = 0;
    for (; k < blocks; k++) {
      if (k > 0 && Atomics.compareExchange(claims, k, free, 1) !== free) break;
      pushRange(fd, parser, bounds[k] as number, bounds[k + 1] as number, buffer);
    }
    let joined = 0;
    if (k < blocks) {
      await ended;
      for (; k < blocks; k++) {
        const part = parts.get(k);
        parts.delete(k);
        if (part && parser.absorb(part)) joined++;
        else pushRange(fd, parser, bounds[k] as number, bounds[k + 1] as number, buffer);
      }
    }
    return joined;
  } finally {
    // Also when a row here is bad: the worker stops rather than read on to the end.
    await worker?.terminate();
  }
}
