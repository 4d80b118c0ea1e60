/** A Float64Array that grows geometrically as values are appended. */
export class GrowableF64 {
  private data: Float64Array;
  length = 0;

  constructor(capacity = 1024) {
    this.data = new Float64Array(Math.max(16, Math.ceil(capacity)));
  }

  push(value: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = value;
  }

  /** The values so far; copies only when the buffer is much larger than needed. */
  finish(): Float64Array {
    if (this.data.length - this.length > 1024 && this.length < this.data.length * 0.9) return this.data.slice(0, this.length);
    return this.data.subarray(0, this.length);
  }
}
