import { type MeasureResult, measure } from './measure.js';
import { readCaptureFile } from './read-capture.js';
import { type Capture, type CaptureChannel, CaptureError, type ProgressFn, type ReadOptions } from './types.js';

export interface AnalyzeOptions extends ReadOptions {
  /** Channel number (1-based) or name; the first channel when absent. */
  readonly channel?: string;
  /** Keep the file's bytes in the result (to copy it into the log). */
  readonly keepBytes?: boolean;
}

export interface AnalyzedCapture extends MeasureResult {
  readonly capture: Capture;
  readonly channel: CaptureChannel;
  readonly bytes?: Uint8Array;
}

/** Pick a channel by number (1-based) or by name (case-insensitive). */
function pickChannel(capture: Capture, which: string | undefined): CaptureChannel {
  const { channels } = capture;
  const names = channels.map((c, i) => `${i + 1} (${c.name})`).join(', ');
  if (which === undefined || which === '') {
    const first = channels[0];
    if (!first) throw new CaptureError(`${capture.source}: no channels`);
    return first;
  }
  if (/^\d+$/.test(which)) {
    const c = channels[Number(which) - 1];
    if (!c) throw new CaptureError(`channel ${which} does not exist; the capture has ${names.length > 200 ? `${names.slice(0, 200)}…` : names}`);
    return c;
  }
  const c = channels.find((ch) => ch.name.toLowerCase() === which.toLowerCase());
  if (!c)
    throw new CaptureError(
      `no channel named ${JSON.stringify(which.length > 40 ? `${which.slice(0, 40)}…` : which)}; the capture has ${names.length > 200 ? `${names.slice(0, 200)}…` : names}`,
    );
  return c;
}

/**
 * Read a capture file and measure one channel. Progress covers the read
 * (the long part for a large CSV); the measurement follows in one go.
 */
export async function analyzeCaptureFile(path: string, options: AnalyzeOptions = {}, onProgress?: ProgressFn): Promise<AnalyzedCapture> {
  const read = await readCaptureFile(path, options, onProgress);
  const channel = pickChannel(read.capture, options.channel);
  if (channel.unit !== 'V') {
    throw new CaptureError(`channel ${channel.name} is in ${JSON.stringify(channel.unit)}, not volts; pick a voltage channel with --channel`);
  }
  let result: MeasureResult;
  try {
    result = measure(channel.samples, read.capture.sampleRate);
  } catch (error) {
    if (error instanceof CaptureError) throw new CaptureError(`${options.name ?? path}: ${error.message}`);
    throw error;
  }
  const warnings = [...read.capture.warnings, ...result.measurements.warnings];
  return {
    measurements: { ...result.measurements, warnings },
    period: result.period,
    capture: read.capture,
    channel,
    ...(read.bytes ? { bytes: read.bytes } : {}),
  };
}
