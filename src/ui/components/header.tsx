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
  /** Cut a long note at its start (for paths, whose end matters) instead of its end. @default false */
  readonly isNoteTail?: boolean;
}

/** One line: `probebook · bench · 12 boards` with a note on the right. */
export function Header({ screen, detail, note, width = 80, isNoteTail = false }: HeaderProps) {
  const left = `probebook · ${screen}${detail ? ` · ${detail}` : ''}`;
  const room = width - left.length - 2;
  let right = '';
  if (note && room > 8) {
    if (note.length <= room) right = note;
    else right = isNoteTail ? `…${note.slice(note.length - room + 1)}` : `${note.slice(0, room - 1)}…`;
  }
  return (
    <Box width={width} justifyContent="space-between">
      <Text bold wrap="truncate-end" {...toneProps('title')}>
        {left}
      </Text>
      {right ? <Text {...toneProps('dim')}>{right}</Text> : null}
    </Box>
  );
}
