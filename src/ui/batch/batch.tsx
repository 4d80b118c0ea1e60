import { Text } from 'ink';
import type { BatchProps } from '../screen-props.js';

// PLACEHOLDER until the screen is written.
export function BatchScreen(_props: BatchProps) {
  return <Text>This screen is not built yet. Press Esc.</Text>;
}
