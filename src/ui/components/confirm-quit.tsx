import { Box, Text, useInput } from 'ink';
import { useState } from 'react';
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
  const [isHelpOpen, setHelpOpen] = useState(false);
  useInput(
    (input, key) => {
      if (input === '?') setHelpOpen((open) => !open);
      else if (input === 'y' || input === 'Y') onQuit();
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
        <Text bold>y</Text> quit and drop it · <Text bold>n</Text>/Esc stay · <Text bold>?</Text> help
      </Text>
      {isHelpOpen ? (
        <Text wrap="wrap" {...toneProps('dim')}>
          Help — quitting: y quits now and the half-typed text is lost; n, Esc or Enter goes back to it. Readings and rework notes already shown as saved are in
          the log and stay there. ? closes this help.
        </Text>
      ) : null}
    </Box>
  );
}
