import { constants, readSync } from 'node:fs';
import { open } from 'node:fs/promises';
import { availableParallelism, loadavg } from 'node:os';
import { basename } from 'node:path';
import { CsvParser, concat } from './csv-parser.js';
import { readRestTwoThreads, type TwoThreadTuning } from './csv-part.js';
import { csvReader } from './csv-reader.js';
import { type Capture, CaptureError, type CaptureReader, type ProgressFn, type ReadOptions } from './types.js';
import { wavReader } from './wav-reader.js';

/** Readers in the order they are tried; WAV first, since text is the fallback. */
export const readers: readonly CaptureReader[] = [wavReader, csvReader];

/** Pick the reader for a file from its name and first bytes. */
function pickReader(name: string, head: Uint8Array): CaptureReader {
  const reader = readers.find((r) => r.canRead(name, head));
  if (!reader) throw new CaptureError(`${name}: binary data, neither CSV text nor a WAV file`);
  return reader;
}

/** Read a capture held in memory. */
export function readCaptureBytes(bytes: Uint8Array, options: ReadOptions = {}, onProgress?: ProgressFn): Capture {
  const name = options.name ?? 'capture';
  if (bytes.length === 0) throw new CaptureError(`${name}: the file is empty`);
  return pickReader(name, bytes.subarray(0, 64)).read(bytes, { ...options, name }, onProgress);
}

export interface FileRead {
  readonly capture: Capture;
  /** The file's bytes, when asked for (to copy it into the log). */
  readonly bytes?: Uint8Array;
}

/**
 * Bytes read at a time. With a progress callback (the bench screen) each read
 * goes through the event loop so the screen can draw; without one (the
 * command line) the reads are synchronous: on a busy machine each trip to the
 * I/O thread pool waits for a core, and a 25 MB capture took ~100 such trips
 * (measured with --cpu-prof: about a fifth of `analyze`'s time was idle).
 */
const chunkBytes = 1024 * 1024;
/** With progress to draw, smaller reads so the bar moves often. */
const progressChunkBytes = 256 * 1024;

/**
 * From this size on, a CSV read for the command line (no progress to draw, the
 * bytes not kept) is split with a worker thread (`csv-part.ts`). Below it the
 * worker's start (a second V8 instance, ~20 ms and ~17 MB resident) costs more
 * than it saves, and the memory goal at 1 M rows (issue 15) rules it out.
 */
const twoThreadBytes = 48 * 1024 * 1024;

/**
 * Whether a second thread would find a core to run on: the last minute's load
 * average leaves most of one idle (half a core of slack, since a script that
 * analyses captures back to back holds the average near 1 on its own). On a machine whose cores are all busy a worker only
 * competes with this thread (measured on the 5 M-row bench capture with a load
 * average of 9 on 2 cores: 0.63× numpy's time, against 0.55× for the command
 * reading on one thread in the same rounds).
 * The same test as `make --load-average` (common practice, no source).
 */
function hasIdleCore(): boolean {
  const cores = availableParallelism();
  return cores >= 2 && (loadavg()[0] ?? 0) <= cores - 0.5;
}

export interface FileReadOptions extends ReadOptions {
  /** Keep the file's bytes (to copy the file into the log). */
  readonly keepBytes?: boolean;
  /** Split CSV files of this many bytes or more with a worker thread (and how); given, it applies whatever the machine's load. @default 48 MiB when a core is idle */
  readonly twoThread?: TwoThreadTuning & { readonly fromBytes?: number };
}

/**
 * Read a capture file in chunks, reporting progress as a fraction of its size.
 * CSV is parsed as the chunks arrive, so its text is never held whole unless
 * `keepBytes` asks for the bytes.
 */
export async function readCaptureFile(path: string, options: FileReadOptions = {}, onProgress?: ProgressFn): Promise<FileRead> {
  const name = options.name ?? basename(path);
  let handle;
  try {
    // Opened without blocking: a FIFO or a device would otherwise hang the open (or the reads) forever.
    handle = await open(path, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (error) {
    throw new CaptureError(ioMessage(path, error));
  }
  try {
    const stat = await handle.stat();
    if (stat.isDirectory()) throw new CaptureError(`${path}: is a folder, not a capture file`);
    if (!stat.isFile()) throw new CaptureError(`${path}: not a regular file (a pipe, a device or a socket); save the capture to a file first`);
    const size = stat.size;
    if (size === 0) throw new CaptureError(`${name}: the file is empty`);
    const kept: Uint8Array[] = [];
    let reader: CaptureReader | undefined;
    let parser: CsvParser | undefined;
    let seen = 0;
    // One buffer, reused once the CSV parser streams: the file is never held whole.
    let spare: Uint8Array | undefined;
    let isTwoThread =
      !onProgress && !options.keepBytes && size >= (options.twoThread?.fromBytes ?? twoThreadBytes) && (options.twoThread !== undefined || hasIdleCore());
    for (;;) {
      const want = Math.min(onProgress ? progressChunkBytes : chunkBytes, Math.max(1, size - seen));
      const buffer = spare && spare.length >= want ? spare : new Uint8Array(want);
      spare = undefined;
      const bytesRead = onProgress ? (await handle.read(buffer, 0, want, seen)).bytesRead : readSync(handle.fd, buffer, 0, want, seen);
      if (bytesRead === 0) break;
      const chunk = buffer.subarray(0, bytesRead);
      if (!reader) {
        reader = pickReader(name, chunk.subarray(0, 64));
        if (reader === csvReader) parser = new CsvParser({ ...options, name }, size);
      }
      if (parser) parser.push(chunk);
      if (!parser || options.keepBytes) kept.push(chunk);
      else if (parser.isStreaming) spare = buffer;
      seen += bytesRead;
      onProgress?.(Math.min(1, seen / size) * (parser ? 1 : 0.5));
      if (isTwoThread && parser?.isStreaming && seen < size) {
        isTwoThread = false;
        if ((await readRestTwoThreads(handle.fd, path, parser, seen, size, { name }, options.twoThread)) >= 0) seen = size;
      }
      if (seen >= size) break;
    }
    // Only what was kept is joined: a streamed CSV keeps nothing.
    const bytes = kept.length === 0 ? undefined : concat(kept, seen);
    const capture = parser ? parser.end() : (reader ?? csvReader).read(bytes ?? new Uint8Array(0), { ...options, name }, (f) => onProgress?.(0.5 + f / 2));
    onProgress?.(1);
    return options.keepBytes && bytes ? { capture, bytes } : { capture };
  } finally {
    await handle.close();
  }
}

function ioMessage(path: string, error: unknown): string {
  const code = (error as { code?: string }).code;
  if (code === 'ENOENT') return `${path}: no such file`;
  if (code === 'EISDIR') return `${path}: is a folder, not a capture file`;
  if (code === 'EACCES' || code === 'EPERM') return `${path}: not allowed to read it`;
  return `${path}: ${error instanceof Error ? error.message : String(error)}`;
}
