import { Text } from 'ink';
import type { BringUpProps } from '../screen-props.js';

// PLACEHOLDER until the screen is written.
export function BringUpScreen(_props: BringUpProps) {
  return <Text>This screen is not built yet. Press Esc.</Text>;
}
