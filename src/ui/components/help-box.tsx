import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';

/** One line of help: the key(s) and what they do. */
export type HelpEntry = readonly [keys: string, what: string];

export interface HelpBoxProps {
  /** The screen the help is for ("bench"). */
  readonly title: string;
  /** The dialog the help is for, when `?` was pressed in one ("starting a run"). */
  readonly topic?: string | undefined;
  readonly entries: readonly HelpEntry[];
  /** Short paragraphs under the keys (what the screen is for, cautions). */
  readonly notes?: readonly string[];
  /** Columns available. @default 80 */
  readonly width?: number;
}

/** The `?` help of a screen: keys in a column, then notes; closed with `?` or Esc. */
export function HelpBox({ title, topic, entries, notes = [], width = 80 }: HelpBoxProps) {
  const keyWidth = Math.min(16, Math.max(...entries.map(([k]) => k.length), 4) + 2);
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={Math.max(30, width)}>
      <Text bold {...toneProps('title')}>
        Help — {topic ? `${topic} (${title} screen)` : `${title} screen`}
      </Text>
      {entries.map(([k, what]) => (
        <Box key={k}>
          <Box width={keyWidth} flexShrink={0}>
            <Text bold>{k}</Text>
          </Box>
          <Text wrap="truncate-end">{what}</Text>
        </Box>
      ))}
      {notes.map((note) => (
        <Text key={note} wrap="wrap" {...toneProps('dim')}>
          {note}
        </Text>
      ))}
      <Text {...toneProps('dim')}>? or Esc closes this help.</Text>
    </Box>
  );
}
