import { Box, Text } from 'ink';
import type { BoardFile } from '../../log/types.js';
import { reworkComparison } from '../../review/history.js';
import { cell } from '../components/columns.js';
import { pointer, toneProps } from '../theme.js';
import { readingText, shortTime } from './timeline-lines.js';

export interface ReworkPanelProps {
  readonly board: BoardFile;
  readonly selected: number;
  readonly rows: number;
  readonly width: number;
}

/** Rework notes, and for the selected one each check's last reading before and first after it. */
export function ReworkPanel({ board, selected, rows, width }: ReworkPanelProps) {
  if (board.rework.length === 0) return <Text>No rework notes on this board.</Text>;
  const rework = board.rework[selected] ?? board.rework[0];
  if (!rework) return null;
  const noteRows = Math.min(board.rework.length, 3);
  const first = Math.max(0, Math.min(selected - 1, board.rework.length - noteRows));
  const table = reworkComparison(board, rework).slice(0, Math.max(1, rows - noteRows - 2));
  const col = Math.max(14, Math.floor((width - 26) / 2));
  return (
    <Box flexDirection="column">
      {board.rework.slice(first, first + noteRows).map((w, i) => (
        <Text key={w.id} inverse={first + i === selected} {...toneProps('accent')}>
          {first + i === selected ? pointer : ' '}
          {cell(`${shortTime(w.at)}  ${w.part} ${w.from} → ${w.to}${w.note ? `: ${w.note}` : ''}`, width - 1)}
        </Text>
      ))}
      <Text bold>{`${cell('check', 24)}  ${cell('before rework', col)}${cell('after rework', col)}`}</Text>
      {table.map((row) => (
        <Text key={row.check}>
          {`${cell(row.check, 24)}  ${cell(row.before ? readingText(row.before) : '— not read', col)}${cell(row.after ? readingText(row.after) : '— not read yet', col)}`}
        </Text>
      ))}
    </Box>
  );
}
