import { formatValue } from '../units/format.js';
import type { Measurements, ShapeClass } from './types.js';

/** What the technician expected to see on the scope. */
export type ExpectedShape = 'sine' | 'square' | 'triangle';

export const expectedShapes: readonly ExpectedShape[] = ['sine', 'square', 'triangle'];

/** A capture that does not look like what was expected. */
export interface ShapeMismatch {
  readonly expected: ExpectedShape;
  readonly found: ShapeClass;
  readonly clipped: boolean;
  readonly notch: boolean;
  /** One line for the screen and for the next-check suggestion. */
  readonly message: string;
}

/**
 * Compare the measured shape with the expected one: a different class, or a
 * sine or triangle that is clipped or notched, is a mismatch.
 */
export function shapeMismatch(m: Measurements, expected: ExpectedShape): ShapeMismatch | null {
  const smooth = expected !== 'square';
  const clipped = smooth && m.clipped;
  const notch = smooth && m.notch;
  if (m.shape === expected && !clipped && !notch) return null;
  const faults: string[] = [];
  if (m.shape !== expected) faults.push(`looks like ${article(m.shape)}`);
  if (clipped) faults.push('is clipped (flat tops: check the rails, the gain and the headroom)');
  if (notch) faults.push('has a crossover notch (a flat step at each crossing: check the output stage bias)');
  return { expected, found: m.shape, clipped, notch, message: `expected ${article(expected)}; the capture ${faults.join(' and ')}` };
}

function article(shape: ShapeClass): string {
  return shape === 'other' ? 'no plain sine, square or triangle' : `a ${shape}`;
}

const pct = (v: number): string => `${(v * 100).toPrecision(3)} %`;

/** The figures as aligned `name  value` lines, in display units. */
export function summaryLines(m: Measurements): string[] {
  const rows: [string, string][] = [
    ['shape', `${m.shape}${m.clipped ? ', clipped' : ''}${m.notch ? ', crossover notch' : ''}`],
    ['frequency', m.frequency === null ? '—' : formatValue(m.frequency, 'Hz', { digits: 6 })],
    ['Vpp', formatValue(m.vpp, 'V')],
    ['mean', formatValue(m.mean, 'V')],
    ['RMS (DC+AC)', formatValue(m.vrms, 'V')],
    ['RMS (AC)', formatValue(m.vrmsAc, 'V')],
    ['THD', m.thd === null ? '—' : pct(m.thd)],
  ];
  if (m.duty !== null) rows.push(['duty', pct(m.duty)]);
  if (m.rise !== null) rows.push(['rise 10–90 %', formatValue(m.rise, 's')]);
  if (m.fall !== null) rows.push(['fall 90–10 %', formatValue(m.fall, 's')]);
  if (m.overshoot !== null) rows.push(['overshoot', pct(m.overshoot)]);
  if (m.notchTime !== null) rows.push(['notch', `${formatValue(m.notchTime, 's')} per crossing`]);
  rows.push(['crest factor', m.crestFactor.toFixed(3)]);
  rows.push(['samples', `${m.samples} at ${formatValue(m.sampleRate, 'Hz')}${m.periods > 0 ? `, ${m.periods} whole periods` : ''}`]);
  const width = Math.max(...rows.map(([k]) => k.length));
  return rows.map(([k, v]) => `${k.padEnd(width)}  ${v}`);
}
