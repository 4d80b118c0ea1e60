import type { BenchLog } from '../../log/types.js';
import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';
import { useCaptureTrace } from './use-capture-trace.js';

export interface CaptureViewProps {
  /** Where the capture's bytes come from. */
  readonly log: Pick<BenchLog, 'readCapture'>;
  readonly file: string | null;
  readonly width: number;
  readonly height: number;
}

/** A saved capture re-drawn as an ASCII trace. */
export function CaptureView({ log, file, width, height }: CaptureViewProps) {
  const { text, isLoading } = useCaptureTrace(log, file, width, Math.max(4, height - 2));
  return (
    <Box flexDirection="column">
      <Text bold>Capture {file ?? '(none)'}</Text>
      <Text>{isLoading ? 'Reading the capture…' : text}</Text>
      <Text {...toneProps('dim')}>Esc back</Text>
    </Box>
  );
}
