import { Box, Text } from 'ink';
import { type Draft, stagesOf } from '../../plan/draft.js';
import { cell } from '../components/columns.js';
import { pointer, toneProps } from '../theme.js';
import { type Row, rowText } from './rows.js';

export interface FormListProps {
  readonly draft: Draft;
  readonly rows: readonly Row[];
  readonly start: number;
  readonly count: number;
  readonly selected: number;
  /** Problem text by row index. */
  readonly problems: ReadonlyMap<number, string>;
  readonly width: number;
}

/** The form: one row a line, `label  value`, a ✗ before a row with a problem, the selected row inverse. */
export function FormList({ draft, rows, start, count, selected, problems, width }: FormListProps) {
  const label = Math.min(22, Math.max(14, Math.floor(width / 3)));
  return (
    <Box flexDirection="column" width={width}>
      {rows.slice(start, start + count).map((row, i) => {
        const at = start + i;
        const isSelected = at === selected;
        const problem = problems.get(at);
        const isHeading = row.label.startsWith('▸');
        const value = row.kind === 'action' ? '' : rowText(draft, row) || (row.isOptional ? '—' : '(empty)');
        return (
          <Text key={row.key} wrap="truncate-end" inverse={isSelected} bold={isHeading || row.kind === 'action'}>
            {isSelected ? pointer : ' '}
            <Text {...(problem ? toneProps('bad') : {})}>{problem ? '✗' : ' '}</Text>
            {cell(row.label, label)}
            <Text {...(row.kind === 'action' ? toneProps('accent') : {})}>{value}</Text>
            {isHeading ? <Text {...toneProps('dim')}> {String(stagesOf(draft)[row.stageIndex ?? 0]?.['kind'] ?? '')}</Text> : null}
          </Text>
        );
      })}
    </Box>
  );
}
