import type { Duplex } from 'node:stream';
import { ByteQueue } from './byte-queue.js';
import { type AnswerState, takeLine, takeRecord } from './answer.js';
import { type AnswerKind, errnoWords, lineCap, recordCap, type Transport, TransportFailure } from './transport.js';

/**
 * A transport over a byte stream (a TCP socket, a serial port): commands are
 * lines ending in `\n`, answers are read from a bounded queue. One query at a
 * time; any failure (timeout, reset, close, flood) closes the stream.
 */
export class StreamTransport implements Transport {
  private readonly queue = new ByteQueue(recordCap);
  private failure: string | null = null;
  private wake: (() => void) | null = null;
  private busy = false;

  constructor(
    private readonly stream: Duplex,
    private readonly where: string,
  ) {
    stream.on('data', (chunk: Buffer) => {
      if (!this.queue.push(chunk)) this.fail(`sent more than ${recordCap >> 20} MiB without ending its answer`);
      this.wake?.();
    });
    stream.on('error', (error) => this.fail(errnoWords(error, where)));
    stream.on('close', () => this.fail(`closed the connection at ${where}`));
  }

  get isOpen(): boolean {
    return this.failure === null;
  }

  private fail(message: string): void {
    if (this.failure === null) this.failure = message;
    this.stream.destroy();
    this.wake?.();
  }

  close(): void {
    this.fail('closed');
  }

  async send(command: string): Promise<void> {
    if (this.failure !== null) throw new TransportFailure(this.failure);
    await new Promise<void>((resolve, reject) => {
      this.stream.write(`${command}\n`, (error) => (error ? reject(new TransportFailure(errnoWords(error, this.where))) : resolve()));
    });
  }

  async query(command: string, kind: AnswerKind, timeoutMs: number, signal?: AbortSignal): Promise<Buffer> {
    if (this.busy) throw new TransportFailure('is still answering the previous query');
    if (this.failure !== null) throw new TransportFailure(this.failure);
    this.busy = true;
    // Bytes left from before this query (an unasked message) are never taken as its answer.
    this.queue.clear();
    const cap = kind === 'line' ? lineCap : recordCap;
    const read = kind === 'line' ? takeLine : takeRecord;
    let timer: NodeJS.Timeout | undefined;
    let onAbort: (() => void) | undefined;
    try {
      await this.send(command);
      let timedOut = false;
      let aborted = signal?.aborted ?? false;
      timer = setTimeout(() => {
        timedOut = true;
        this.wake?.();
      }, timeoutMs);
      onAbort = () => {
        aborted = true;
        this.wake?.();
      };
      signal?.addEventListener('abort', onAbort);
      for (;;) {
        if (aborted) throw new TransportFailure('was cancelled');
        const state: AnswerState = read(this.queue);
        if (state.kind === 'done') return state.bytes;
        if (state.kind === 'bad') throw new TransportFailure(`sent a malformed answer: ${state.message}`);
        if (this.queue.length > cap) throw new TransportFailure(`sent more than ${cap >> 10} KiB without ending its answer`);
        if (this.failure !== null) throw new TransportFailure(this.failure);
        if (timedOut) throw new TransportFailure(`gave no ${this.queue.length > 0 ? 'complete ' : ''}answer to ${command} within ${formatMs(timeoutMs)}`);
        await new Promise<void>((resolve) => {
          this.wake = resolve;
        });
        this.wake = null;
      }
    } catch (error) {
      // After a failed query the stream state is unknown: close it, the session reconnects.
      this.fail(error instanceof Error ? error.message : String(error));
      throw error instanceof TransportFailure ? error : new TransportFailure(String(error));
    } finally {
      clearTimeout(timer);
      if (onAbort) signal?.removeEventListener('abort', onAbort);
      this.busy = false;
    }
  }
}

export function formatMs(ms: number): string {
  return ms >= 1000 ? `${+(ms / 1000).toFixed(2)} s` : `${ms} ms`;
}
