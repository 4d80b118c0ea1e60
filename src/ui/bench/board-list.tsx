import { Box, Text } from 'ink';
import type { BoardHead } from '../../log/types.js';
import { pointer, stateTone, toneProps } from '../theme.js';
import { boardCells, boardColumns, boardHeader } from './board-columns.js';

export interface BoardListProps {
  readonly boards: readonly BoardHead[];
  /** Index of the first row shown. */
  readonly start: number;
  /** Rows shown. */
  readonly rows: number;
  readonly selected: number;
  readonly width: number;
}

/** The boards table: serial, plan, last run, state (mark and word), runs and readings. */
export function BoardList({ boards, start, rows, selected, width }: BoardListProps) {
  const col = boardColumns(width);
  const head = boardHeader(col);
  return (
    <Box flexDirection="column">
      <Text bold wrap="truncate-end">
        {head}
      </Text>
      {boards.slice(start, start + rows).map((b, i) => {
        const isSelected = start + i === selected;
        const cells = boardCells(b, col);
        return (
          <Text key={b.serial} wrap="truncate-end" inverse={isSelected}>
            {isSelected ? `${pointer} ` : '  '}
            {cells.before}
            <Text {...(isSelected ? {} : toneProps(stateTone[b.state]))}>{cells.state}</Text>
            {cells.after}
          </Text>
        );
      })}
    </Box>
  );
}
