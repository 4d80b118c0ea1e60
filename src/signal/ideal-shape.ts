import { shapeFeatures } from './shape.js';
import type { ExpectedShape } from './summary.js';

/**
 * The shape class of an ideal (model) waveform from its crest factor, peak
 * over AC RMS: 1 for a square, √2 for a sine, √3 for a triangle (RMS of each:
 * any signals handbook). Undefined for anything in between, such as a clipped
 * sine, and for a flat trace (no AC RMS). The crest factor is the one
 * `shapeFeatures` computes for a capture's period, so the two agree.
 */
export function idealShape(samples: Float64Array): ExpectedShape | undefined {
  if (samples.length < 8) return undefined;
  const crest = shapeFeatures(samples).crestFactor;
  if (!Number.isFinite(crest)) return undefined;
  if (crest < 1.1) return 'square';
  if (crest > 1.35 && crest < 1.5) return 'sine';
  if (crest > 1.65 && crest < 1.85) return 'triangle';
  return undefined;
}
