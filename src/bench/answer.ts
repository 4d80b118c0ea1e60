import type { ByteQueue } from './byte-queue.js';
import { blockHeader } from './scpi.js';

/** What the bytes received so far hold: a whole answer, not yet, or a malformed one. */
export type AnswerState = { readonly kind: 'done'; readonly bytes: Buffer } | { readonly kind: 'wait' } | { readonly kind: 'bad'; readonly message: string };

const newline = 0x0a;

/** One answer line, without its `\n` (and a `\r` before it). */
export function takeLine(q: ByteQueue): AnswerState {
  const end = q.indexOf(newline);
  if (end < 0) return { kind: 'wait' };
  const line = q.take(end + 1);
  const stop = end > 0 && line[end - 1] === 0x0d ? end - 1 : end;
  return { kind: 'done', bytes: line.subarray(0, stop) };
}

/**
 * A record answer: a definite-length block (`#<n><len><bytes>`, its trailing
 * newline consumed when present) or, when it does not start with `#`, one
 * line (an ASCII list).
 */
export function takeRecord(q: ByteQueue): AnswerState {
  if (q.length === 0) return { kind: 'wait' };
  if (q.peek(1)[0] !== 0x23) return takeLine(q);
  const head = blockHeader(q.peek(Math.min(q.length, 11)));
  if (head.kind === 'bad') return { kind: 'bad', message: head.message };
  if (head.kind === 'incomplete') return { kind: 'wait' };
  const whole = head.start + head.length;
  if (q.length < whole) return { kind: 'wait' };
  const block = q.take(whole);
  // The terminator after a block (IEEE 488.2 ends the message with a newline); skip it when already here.
  if (q.length > 0 && q.peek(1)[0] === newline) q.take(1);
  return { kind: 'done', bytes: block };
}
