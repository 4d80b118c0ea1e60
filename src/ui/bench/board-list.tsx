import { Box, Text } from 'ink';
import type { BoardHead } from '../../log/types.js';
import { cell } from '../components/columns.js';
import { pointer, stateMark, stateTone, stateWord, toneProps } from '../theme.js';
import { formatWhen } from './board-order.js';

export interface BoardListProps {
  readonly boards: readonly BoardHead[];
  /** Index of the first row shown. */
  readonly start: number;
  /** Rows shown. */
  readonly rows: number;
  readonly selected: number;
  readonly width: number;
}

/** Which columns fit: serial, plan and state always; last run from 64 columns, counts from 90. */
function layout(width: number) {
  const showWhen = width >= 64;
  const showCounts = width >= 90;
  const fixed = 2 + 14 + (showWhen ? 18 : 0) + (showCounts ? 24 : 0);
  const serial = Math.max(8, Math.min(24, Math.floor((width - fixed) * 0.55)));
  const plan = Math.max(6, width - fixed - serial - 1);
  return { showWhen, showCounts, serial, plan: Math.min(plan, 24) };
}

/** The boards table: serial, plan, last run, state (mark and word), runs and readings. */
export function BoardList({ boards, start, rows, selected, width }: BoardListProps) {
  const col = layout(width);
  const head =
    '  ' +
    cell('serial', col.serial) +
    cell('plan', col.plan + 1) +
    (col.showWhen ? cell('last run', 18) : '') +
    cell('state', 14) +
    (col.showCounts ? cell('runs', 6, 'right') + cell('readings', 10, 'right') + cell('rework', 8, 'right') : '');
  return (
    <Box flexDirection="column">
      <Text bold wrap="truncate-end">
        {head}
      </Text>
      {boards.slice(start, start + rows).map((b, i) => {
        const isSelected = start + i === selected;
        const state = `${stateMark[b.state]} ${stateWord[b.state]}`;
        return (
          <Text key={b.serial} wrap="truncate-end" inverse={isSelected}>
            {isSelected ? `${pointer} ` : '  '}
            {cell(b.serial, col.serial)}
            {cell(b.plan ?? '—', col.plan + 1)}
            {col.showWhen ? cell(formatWhen(b.lastRunAt), 18) : ''}
            <Text {...(isSelected ? {} : toneProps(stateTone[b.state]))}>{cell(state, 14)}</Text>
            {col.showCounts ? cell(String(b.runs), 6, 'right') + cell(String(b.readings), 10, 'right') + cell(String(b.rework), 8, 'right') : ''}
          </Text>
        );
      })}
    </Box>
  );
}
