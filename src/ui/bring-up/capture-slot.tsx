import { basename } from 'node:path';
import { shapeFeatures } from '../../signal/shape.js';
import type { ExpectedShape } from '../../signal/summary.js';
import { CaptureAttach } from '../capture/capture-attach.js';
import type { CaptureFigures } from './capture-readings.js';

export interface CaptureSlotProps {
  /** The shape the check's test point should show, when known. */
  readonly expect: ExpectedShape | undefined;
  readonly width: number;
  readonly onDone: (capture: CaptureFigures) => void;
  readonly onCancel: () => void;
}

/** The capture attach box, handing its figures over as the bring-up screen needs them. */
export function CaptureSlot({ expect, width, onDone, onCancel }: CaptureSlotProps) {
  return (
    <CaptureAttach
      width={width}
      {...(expect ? { expect } : {})}
      onCancel={onCancel}
      onDone={(r) => onDone({ name: basename(r.path), bytes: r.bytes, measurements: r.measurements, samples: r.samples, sampleRate: r.sampleRate })}
    />
  );
}

/**
 * The shape class of an ideal waveform from its crest factor (peak over AC RMS):
 * 1 for a square, √2 for a sine, √3 for a triangle (RMS of each: any signals
 * handbook). Undefined for anything in between, such as a clipped sine.
 */
export function shapeOf(samples: Float64Array): ExpectedShape | undefined {
  if (samples.length < 8) return undefined;
  // The crest factor as src/signal computes it for a capture's period (NaN for a flat trace).
  const crest = shapeFeatures(samples).crestFactor;
  if (!Number.isFinite(crest)) return undefined;
  if (crest < 1.1) return 'square';
  if (crest > 1.35 && crest < 1.5) return 'sine';
  if (crest > 1.65 && crest < 1.85) return 'triangle';
  return undefined;
}
