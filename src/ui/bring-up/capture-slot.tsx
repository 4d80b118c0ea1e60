import { basename } from 'node:path';
import type { ExpectedShape } from '../../signal/summary.js';
import type { Measurements } from '../../signal/types.js';
import { CaptureAttach } from '../capture/capture-attach.js';

/** A capture as the attach box hands it to the bring-up screen. */
export interface CaptureFigures {
  readonly name: string;
  readonly bytes: Uint8Array;
  readonly measurements: Measurements;
  readonly samples: Float64Array;
  readonly sampleRate: number;
  /** One period averaged over the capture, from a rising mean-level crossing (empty when none). */
  readonly period?: Float64Array;
}

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
