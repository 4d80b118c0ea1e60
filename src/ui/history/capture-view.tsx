import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';
import { useCaptureTrace } from './use-capture-trace.js';

export interface CaptureViewProps {
  readonly dir: string;
  readonly file: string | null;
  readonly width: number;
  readonly height: number;
}

/** A saved capture re-drawn as an ASCII trace. */
export function CaptureView({ dir, file, width, height }: CaptureViewProps) {
  const { text, isLoading } = useCaptureTrace(dir, file, width, Math.max(4, height - 2));
  return (
    <Box flexDirection="column">
      <Text bold>Capture {file ?? '(none)'}</Text>
      <Text>{isLoading ? 'Reading the capture…' : text}</Text>
      <Text {...toneProps('dim')}>Esc back</Text>
    </Box>
  );
}
