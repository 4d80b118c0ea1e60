/** One channel of a capture: samples in the channel's unit (volts after scaling). */
export interface CaptureChannel {
  readonly name: string;
  /** `V` for voltages; other units are kept as read from the header. */
  readonly unit: string;
  readonly samples: Float64Array;
}

/** A capture as read from a file: uniformly sampled channels. */
export interface Capture {
  readonly channels: readonly CaptureChannel[];
  /** Samples per second. */
  readonly sampleRate: number;
  /** Sample interval, s (1 / sampleRate). */
  readonly dt: number;
  /** Where the capture came from, for messages (`scope.csv`, `CSV, 2 channels`). */
  readonly source: string;
  /** Suspect but usable things seen while reading (irregular time steps, …). */
  readonly warnings: readonly string[];
}

/** How to read a capture; every field is optional. */
export interface ReadOptions {
  /** Fixed sample interval, s, for files without a time column. */
  readonly dt?: number;
  /** Volts per full scale for WAV files. @default 1 */
  readonly scale?: number;
  /** File name for messages and for picking the reader. */
  readonly name?: string;
}

/** Progress of a long read, as a fraction of the bytes seen. */
export type ProgressFn = (fraction: number) => void;

/**
 * A capture file format: one small module per format, picked by content and
 * extension in `read-capture.ts`.
 */
export interface CaptureReader {
  readonly format: string;
  /** Whether this reader takes the file, from its name and its first bytes. */
  canRead(name: string, head: Uint8Array): boolean;
  /** Read the whole file; throws `CaptureError` with a line number where one applies. */
  read(bytes: Uint8Array, options: ReadOptions, onProgress?: ProgressFn): Capture;
}

/** A capture that cannot be read or measured: one clear line for the technician. */
export class CaptureError extends Error {
  override readonly name = 'CaptureError';
}

/** Shape classes of a periodic capture. */
export type ShapeClass = 'sine' | 'square' | 'triangle' | 'other';

/**
 * What probebook measures on a capture, SI units, fractions for duty, THD and
 * overshoot. `null` where a figure does not apply (no edges on a sine) or could
 * not be found (no periodic crossings).
 */
export interface Measurements {
  readonly samples: number;
  readonly sampleRate: number;
  /** Fundamental frequency, Hz. */
  readonly frequency: number | null;
  readonly vpp: number;
  readonly min: number;
  readonly max: number;
  /** Total RMS (DC + AC, as a true-RMS meter reads) over whole periods, V. */
  readonly vrms: number;
  /** AC RMS (mean removed) over whole periods, V. */
  readonly vrmsAc: number;
  /** Mean over whole periods, V. */
  readonly mean: number;
  /** Fraction of the period above the mid reference level; null for a sine or a triangle. */
  readonly duty: number | null;
  /** 10–90 % rise time per IEEE Std 181-2011, s; null unless the shape is a square. */
  readonly rise: number | null;
  /** 90–10 % fall time per IEEE Std 181-2011, s; null unless the shape is a square. */
  readonly fall: number | null;
  /** Overshoot after the rising edge, fraction of the amplitude; null unless a square. */
  readonly overshoot: number | null;
  /** RSS of harmonics 2…50 (or below Nyquist) over the fundamental (DESIGN §4). */
  readonly thd: number | null;
  readonly shape: ShapeClass;
  /** Flat tops: the signal sits at its extremes for a share of the period a smooth wave never does. */
  readonly clipped: boolean;
  /** A flat step around the mean level at each zero crossing (push-pull dead band). */
  readonly notch: boolean;
  /** How long the output dwells on the flat step at each crossing, s, when there is a notch. */
  readonly notchTime: number | null;
  /** Peak over AC RMS. */
  readonly crestFactor: number;
  /** AC RMS over mean absolute deviation. */
  readonly formFactor: number;
  /** Whole periods the figures were taken over. */
  readonly periods: number;
  /** How the spectrum was taken, in words. */
  readonly window: string;
  readonly warnings: readonly string[];
}
