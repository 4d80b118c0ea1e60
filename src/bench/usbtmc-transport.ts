import { type FileHandle, open } from 'node:fs/promises';
import { addressText, type InstrumentAddress } from './address.js';
import { ByteQueue } from './byte-queue.js';
import { type AnswerState, takeLine, takeRecord } from './answer.js';
import { formatMs } from './stream-transport.js';
import { type AnswerKind, errnoWords, lineCap, recordCap, type Transport, TransportFailure } from './transport.js';

/**
 * The Linux USBTMC character device (`usbtmc://DEVICE`): a write sends one
 * message, each read returns part of the answer. The kernel driver has its
 * own timeout (5 s by default, from memory); a read it has not finished
 * keeps one thread of Node's pool until it does, but the query gives up on
 * time all the same and the device is closed and reopened next time.
 */
export class UsbtmcTransport implements Transport {
  private failure: string | null = null;

  private constructor(
    private readonly handle: FileHandle,
    private readonly where: string,
  ) {}

  static async open(address: Extract<InstrumentAddress, { kind: 'usbtmc' }>): Promise<UsbtmcTransport> {
    const where = addressText(address);
    try {
      return new UsbtmcTransport(await open(address.device, 'r+'), where);
    } catch (error) {
      throw new TransportFailure(errnoWords(error, where));
    }
  }

  get isOpen(): boolean {
    return this.failure === null;
  }

  close(): void {
    if (this.failure === null) this.failure = 'closed';
    this.handle.close().catch(() => undefined);
  }

  async send(command: string): Promise<void> {
    if (this.failure !== null) throw new TransportFailure(this.failure);
    try {
      await this.handle.write(`${command}\n`);
    } catch (error) {
      this.close();
      throw new TransportFailure(errnoWords(error, this.where));
    }
  }

  async query(command: string, kind: AnswerKind, timeoutMs: number, signal?: AbortSignal): Promise<Buffer> {
    await this.send(command);
    const queue = new ByteQueue(recordCap);
    const cap = kind === 'line' ? lineCap : recordCap;
    const read = kind === 'line' ? takeLine : takeRecord;
    const deadline = Date.now() + timeoutMs;
    try {
      for (;;) {
        if (signal?.aborted) throw new TransportFailure('was cancelled');
        const left = deadline - Date.now();
        if (left <= 0) throw new TransportFailure(`gave no answer to ${command} within ${formatMs(timeoutMs)}`);
        const buffer = Buffer.alloc(64 * 1024);
        let timer: NodeJS.Timeout | undefined;
        const chunk = await Promise.race([
          this.handle.read(buffer, 0, buffer.length, null).then((r) => buffer.subarray(0, r.bytesRead)),
          new Promise<null>((resolve) => {
            timer = setTimeout(() => resolve(null), left);
          }),
        ]).finally(() => clearTimeout(timer));
        if (chunk === null) throw new TransportFailure(`gave no answer to ${command} within ${formatMs(timeoutMs)}`);
        if (chunk.length === 0) throw new TransportFailure(`closed the device at ${this.where}`);
        queue.push(chunk);
        const state: AnswerState = read(queue);
        if (state.kind === 'done') return state.bytes;
        if (state.kind === 'bad') throw new TransportFailure(`sent a malformed answer: ${state.message}`);
        if (queue.length > cap) throw new TransportFailure(`sent more than ${cap >> 10} KiB without ending its answer`);
      }
    } catch (error) {
      this.close();
      if (error instanceof TransportFailure) throw error;
      throw new TransportFailure(errnoWords(error, this.where));
    }
  }
}
