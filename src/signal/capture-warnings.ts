import type { Measurements } from './types.js';

/** What looks wrong in a capture's shape, in words: a shape other than the expected one, clipping, a crossover notch. */
export function captureWarnings(m: Pick<Measurements, 'shape' | 'clipped' | 'notch'>, expected: string | undefined): string[] {
  const out: string[] = [];
  if (expected && m.shape !== expected)
    out.push(`the capture looks like a ${m.shape === 'other' ? 'distorted wave' : m.shape} where a ${expected} is expected`);
  if (m.clipped) out.push('the capture is clipped (flat tops): check the stage gain and the rails');
  if (m.notch) out.push('the capture shows a crossover notch: check the output stage bias');
  return out;
}
