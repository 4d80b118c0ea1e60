/**
 * Bytes received from an instrument, kept as a list of chunks (no copy per
 * chunk), with a hard cap so that a peer sending megabytes without a
 * terminator can neither hang nor exhaust the process.
 */
export class ByteQueue {
  private chunks: Buffer[] = [];
  private total = 0;

  constructor(readonly cap: number) {}

  get length(): number {
    return this.total;
  }

  /** Add a chunk; false when the cap is passed (the caller gives up on the answer). */
  push(chunk: Buffer): boolean {
    this.chunks.push(chunk);
    this.total += chunk.length;
    return this.total <= this.cap;
  }

  clear(): void {
    this.chunks = [];
    this.total = 0;
  }

  /** Index of the first `byte` at or after `from`, or −1. */
  indexOf(byte: number, from = 0): number {
    let base = 0;
    for (const c of this.chunks) {
      if (from < base + c.length) {
        const i = c.indexOf(byte, Math.max(0, from - base));
        if (i >= 0) return base + i;
      }
      base += c.length;
    }
    return -1;
  }

  /** The first `n` bytes as one buffer (a copy only when they span chunks). */
  peek(n: number): Buffer {
    const first = this.chunks[0];
    if (first && first.length >= n) return first.subarray(0, n);
    return Buffer.concat(this.chunks, this.total).subarray(0, n);
  }

  /** Remove and return the first `n` bytes. */
  take(n: number): Buffer {
    const all = this.chunks.length === 1 ? (this.chunks[0] as Buffer) : Buffer.concat(this.chunks, this.total);
    const out = all.subarray(0, n);
    const rest = all.subarray(n);
    this.chunks = rest.length > 0 ? [rest] : [];
    this.total = rest.length;
    return out;
  }
}
