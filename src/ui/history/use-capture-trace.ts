import { useEffect, useState } from 'react';
import type { BenchLog } from '../../log/types.js';
import { readCaptureBytes } from '../../signal/read-capture.js';
import { traceChart } from '../charts/trace.js';

/** The chart of a saved capture (by its file name in the log, folder or database), drawn once loaded. */
export function useCaptureTrace(log: Pick<BenchLog, 'readCapture'>, file: string | null, width: number, height: number): { text: string; isLoading: boolean } {
  const [state, setState] = useState<{ file: string | null; text: string }>({ file: null, text: '' });
  useEffect(() => {
    if (!file) return;
    let isCurrent = true;
    log
      .readCapture(file)
      .then((bytes) => {
        if (!bytes) throw new Error('the log does not hold it');
        return readCaptureBytes(bytes, { name: file });
      })
      .then(
        (capture) => {
          const channel = capture.channels[0];
          const text = channel
            ? `${traceChart(null, channel.samples, { width, height, unit: channel.unit })}\n${capture.source}, ${channel.samples.length} samples at ${capture.sampleRate} S/s`
            : 'the capture has no channels';
          if (isCurrent) setState({ file, text });
        },
        (error: unknown) => isCurrent && setState({ file, text: `cannot draw ${file}: ${error instanceof Error ? error.message : String(error)}` }),
      );
    return () => {
      isCurrent = false;
    };
  }, [log, file, width, height]);
  return file && state.file === file ? { text: state.text, isLoading: false } : { text: '', isLoading: file !== null };
}
