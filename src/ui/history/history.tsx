import { Text } from 'ink';
import type { HistoryProps } from '../screen-props.js';

// PLACEHOLDER until the screen is written.
export function HistoryScreen(_props: HistoryProps) {
  return <Text>This screen is not built yet. Press Esc.</Text>;
}
