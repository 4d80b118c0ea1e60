import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';

export interface AskBoxProps {
  readonly title: string;
  readonly detail: string;
  /** What `y` does. */
  readonly yes: string;
  readonly isHelpOpen: boolean;
}

/** A yes/no question: `y` does it, `n`, Esc or Enter stay (the safe default). */
export function AskBox({ title, detail, yes, isHelpOpen }: AskBoxProps) {
  return (
    <Box flexDirection="column" borderStyle="double" paddingX={1}>
      <Text bold {...toneProps('warn')}>
        {title}
      </Text>
      <Text wrap="wrap">{detail}</Text>
      <Text>
        <Text bold>y</Text> {yes} · <Text bold>n</Text>/Esc stay · <Text bold>?</Text> help
      </Text>
      {isHelpOpen ? (
        <Text wrap="wrap" {...toneProps('dim')}>
          Staying is the default: Enter and Esc both stay. Save first with s (only a plan that loads is saved).
        </Text>
      ) : null}
    </Box>
  );
}
