import { Box, Text } from 'ink';
import type { TimelineEntry } from '../../review/history.js';
import { scrollWindow } from '../components/scroll-window.js';
import { pointer, toneProps, verdictTone } from '../theme.js';
import { timelineLine } from './timeline-lines.js';

export interface TimelineListProps {
  readonly entries: readonly TimelineEntry[];
  readonly selected: number;
  readonly rows: number;
  readonly width: number;
}

/** The board's timeline, a window of `rows` rows around the selection. */
export function TimelineList({ entries, selected, rows, width }: TimelineListProps) {
  if (entries.length === 0) return <Text>No runs or readings on this board yet.</Text>;
  const { start, end } = scrollWindow(entries.length, selected, rows, selected - Math.floor(rows / 2));
  return (
    <Box flexDirection="column">
      {entries.slice(start, end).map((e, i) => {
        const isSelected = start + i === selected;
        const tone = e.kind === 'reading' ? toneProps(verdictTone[e.reading.verdict]) : e.kind === 'rework' ? toneProps('accent') : {};
        return (
          <Text key={`${e.kind}-${start + i}`} inverse={isSelected} {...tone}>
            {isSelected ? pointer : ' '}
            {timelineLine(e, width - 1)}
          </Text>
        );
      })}
    </Box>
  );
}
