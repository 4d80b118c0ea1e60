import { Box, Text, useInput } from 'ink';
import { toneProps } from '../theme.js';

export interface ConfirmQuitProps {
  /** Why quitting needs a second thought ("a reading is half typed"). */
  readonly reason: string;
  readonly onQuit: () => void;
  readonly onStay: () => void;
  /** @default true */
  readonly isActive?: boolean;
}

/** Asks before quitting: `y` quits, `n`, Esc or Enter stays (staying is the safe default). */
export function ConfirmQuit({ reason, onQuit, onStay, isActive = true }: ConfirmQuitProps) {
  useInput(
    (input, key) => {
      if (input === 'y' || input === 'Y') onQuit();
      else if (input === 'n' || input === 'N' || key.escape || key.return) onStay();
    },
    { isActive },
  );
  return (
    <Box flexDirection="column" borderStyle="double" paddingX={1}>
      <Text bold {...toneProps('warn')}>
        Quit probebook?
      </Text>
      <Text>{reason}; it has not been saved.</Text>
      <Text>
        <Text bold>y</Text> quit and drop it · <Text bold>n</Text>/Esc stay
      </Text>
    </Box>
  );
}
