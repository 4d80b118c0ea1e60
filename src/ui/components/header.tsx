import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';

export interface HeaderProps {
  /** Screen name (DESIGN §8): bench, bring-up, history, batch, plan. */
  readonly screen: string;
  /** What the screen is showing (a serial, a plan id), shown after the name. */
  readonly detail?: string;
  /** Right-hand note (the log folder, a count). */
  readonly note?: string;
  /** @default 80 */
  readonly width?: number;
}

/** One line: `probebook · bench · 12 boards` with a note on the right. */
export function Header({ screen, detail, note, width = 80 }: HeaderProps) {
  const left = `probebook · ${screen}${detail ? ` · ${detail}` : ''}`;
  const room = width - left.length - 2;
  const right = note && room > 8 ? (note.length > room ? `…${note.slice(note.length - room + 1)}` : note) : '';
  return (
    <Box width={width} justifyContent="space-between">
      <Text bold wrap="truncate-end" {...toneProps('title')}>
        {left}
      </Text>
      {right ? <Text {...toneProps('dim')}>{right}</Text> : null}
    </Box>
  );
}
