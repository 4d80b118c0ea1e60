import type { Reading, Rework } from '../../log/types.js';
import type { RunReading, RunRework } from '../../run/types.js';

/** A saved reading as the run holds it. */
export function toRunReading(r: Reading): RunReading {
  const base: RunReading = { id: r.id, check: r.check, value: r.value, unit: r.unit, verdict: r.verdict, at: r.at, raw: r.raw };
  if (r.capture === undefined) return base;
  // Shape warnings saved with a capture's readings steer the next suggestion (src/run/suggest.ts).
  const shape = r.warnings?.find((w) => w.startsWith('the capture '));
  return shape === undefined ? { ...base, capture: r.capture } : { ...base, capture: r.capture, shapeWarning: shape };
}

/** A saved rework note as the run holds it. */
export function toRunRework(w: Rework): RunRework {
  return { id: w.id, part: w.part, from: w.from, to: w.to, note: w.note, at: w.at };
}
