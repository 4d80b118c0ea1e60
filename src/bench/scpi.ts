/**
 * SCPI answers: numbers (IEEE 488.2 NR1/NR2/NR3 decimal numeric forms), the
 * overflow value 9.9E37 (SCPI 1999.0, from memory), error strings and
 * definite-length arbitrary blocks (`#<n><length><bytes>`, IEEE 488.2 §8.7.9,
 * from memory).
 */

/** What one numeric answer meant. */
export type ScpiNumber =
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'overload' }
  | { readonly kind: 'error'; readonly message: string };

// NR1 (integer), NR2 (fixed point) and NR3 (exponent) with an optional sign; no units.
const numeric = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
/** 9.9E37 and anything at least that large is the SCPI overflow (over range) value. */
const overflow = 9.9e37;

/** Cut a text for a one-line message. */
export function shortText(text: string, max = 60): string {
  const clean = text.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ').trim();
  return clean.length > max ? `${clean.slice(0, max)}…` : clean;
}

/** Read one SCPI numeric answer (a line without its terminator). */
export function parseScpiNumber(answer: string): ScpiNumber {
  const text = answer.trim();
  // Some meters answer a list with one entry per channel: take none of that silently.
  if (numeric.test(text)) {
    const value = Number(text);
    if (!Number.isFinite(value)) return { kind: 'error', message: `answered ${JSON.stringify(shortText(text))}, which is no finite number` };
    if (Math.abs(value) >= overflow * 0.999) return { kind: 'overload' };
    return { kind: 'number', value };
  }
  // An error queue entry read in place of a value: `-113,"Undefined header"`.
  const err = /^([+-]?\d+)\s*,\s*"(.*)"$/.exec(text);
  if (err) return { kind: 'error', message: `answered with SCPI error ${err[1]} ${JSON.stringify(shortText(err[2] ?? ''))}` };
  if (text === '') return { kind: 'error', message: 'answered an empty line' };
  return { kind: 'error', message: `answered ${JSON.stringify(shortText(text))}, which is not a number` };
}

/** Where a definite-length block's data lie in a buffer, or why it is not one. */
export type BlockHeader =
  | { readonly kind: 'block'; readonly start: number; readonly length: number }
  | { readonly kind: 'incomplete' }
  | { readonly kind: 'bad'; readonly message: string };

/**
 * Find the data of an IEEE 488.2 definite-length arbitrary block at the start
 * of `buf`: `#`, one digit n (1–9), n digits of length, then the bytes.
 * `#0` (indefinite length) is not accepted: its end cannot be told from data.
 */
export function blockHeader(buf: Uint8Array): BlockHeader {
  if (buf.length < 2) return { kind: 'incomplete' };
  if (buf[0] !== 0x23) return { kind: 'bad', message: 'the answer is not a block (no leading #)' };
  const n = (buf[1] ?? 0) - 0x30;
  if (n === 0) return { kind: 'bad', message: 'an indefinite-length block (#0) is not read: set the instrument to definite-length blocks' };
  if (n < 1 || n > 9) return { kind: 'bad', message: 'the block header has no length digit after #' };
  if (buf.length < 2 + n) return { kind: 'incomplete' };
  let length = 0;
  for (let i = 0; i < n; i++) {
    const d = (buf[2 + i] ?? 0) - 0x30;
    if (d < 0 || d > 9) return { kind: 'bad', message: 'the block length holds a character that is no digit' };
    length = length * 10 + d;
  }
  return { kind: 'block', start: 2 + n, length };
}

/** Sample formats a scope sends its record in. */
export type CaptureFormat = 'ascii' | 'int8' | 'int16';

/**
 * Decode a scope record: an ASCII comma list, or a block of signed 8-bit or
 * 16-bit samples (16-bit little-endian unless `bigEndian`). Returns raw codes
 * (to be scaled by the caller) or a message.
 */
export function decodeRecord(data: Uint8Array, format: CaptureFormat, bigEndian = false): Float64Array | { readonly problem: string } {
  if (format === 'ascii') {
    const text = Buffer.from(data).toString('latin1').trim();
    const fields = text.split(',');
    const out = new Float64Array(fields.length);
    for (let i = 0; i < fields.length; i++) {
      const f = (fields[i] ?? '').trim();
      if (!numeric.test(f)) return { problem: `record entry ${i + 1} is ${JSON.stringify(shortText(f, 20))}, not a number` };
      out[i] = Number(f);
    }
    return out;
  }
  const head = blockHeader(data);
  if (head.kind === 'incomplete') return { problem: 'the block ended before its header did' };
  if (head.kind === 'bad') return { problem: head.message };
  if (data.length < head.start + head.length) return { problem: `the block promised ${head.length} bytes and held ${data.length - head.start}` };
  const bytes = Buffer.from(data.buffer, data.byteOffset + head.start, head.length);
  if (format === 'int8') {
    const out = new Float64Array(bytes.length);
    for (let i = 0; i < bytes.length; i++) out[i] = bytes.readInt8(i);
    return out;
  }
  if (bytes.length % 2 !== 0) return { problem: `a 16-bit block of ${bytes.length} bytes (odd) is not whole` };
  const out = new Float64Array(bytes.length / 2);
  for (let i = 0; i < out.length; i++) out[i] = bigEndian ? bytes.readInt16BE(2 * i) : bytes.readInt16LE(2 * i);
  return out;
}
