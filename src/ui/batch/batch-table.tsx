import { Box, Text } from 'ink';
import { useMemo } from 'react';
import type { BatchCheck } from '../../review/batch-types.js';
import { cpkWord, formatIndex, formatPercent } from '../../review/format.js';
import { cell } from '../components/columns.js';
import { scrollWindow } from '../components/scroll-window.js';
import { pointer, toneProps, type Tone } from '../theme.js';

export interface BatchTableProps {
  readonly rows: readonly BatchCheck[];
  readonly selected: number;
  readonly height: number;
  readonly width: number;
}

function word(c: BatchCheck): { text: string; tone: Tone } {
  if (c.status === 'no-band') return { text: 'no band', tone: 'dim' };
  if (c.status === 'not-enough-data' || c.status === 'no-spread') return { text: 'not enough data', tone: 'dim' };
  const text = cpkWord(c.cpk);
  return { text, tone: text === 'capable' ? 'good' : text === 'tight' ? 'warn' : 'bad' };
}

/**
 * A row's name: the check id, led by its plan when the rows come from more than
 * one plan (two plans may both have an `osc.freq`; their figures are apart).
 */
export function checkLabeller(rows: readonly BatchCheck[]): (c: BatchCheck) => string {
  const isMultiPlan = new Set(rows.map((r) => r.plan)).size > 1;
  return (c) => (isMultiPlan && c.plan !== null ? `${c.plan} ${c.check}` : c.check);
}

/** Checks weakest first: counts, final yield, Cp, Cpk and a capability word. */
export function BatchTable({ rows, selected, height, width }: BatchTableProps) {
  // 1 pointer + 43 figures + 2 + 15 capability = 61 columns besides the check id;
  // counts get 6 columns so 10,000 boards still leave a space between them.
  const checkWidth = Math.max(12, width - 62);
  const { start, end } = scrollWindow(rows.length, selected, height, selected - Math.floor(height / 2));
  const label = useMemo(() => checkLabeller(rows), [rows]);
  return (
    <Box flexDirection="column">
      <Text
        bold
        wrap="truncate-end"
      >{` ${cell('weakest first', checkWidth)}${cell('n', 6, 'right')}${cell('pass', 6, 'right')}${cell('marg', 6, 'right')}${cell('fail', 6, 'right')}${cell('final', 7, 'right')}${cell('Cp', 6, 'right')}${cell('Cpk', 6, 'right')}  capability`}</Text>
      {rows.slice(start, end).map((c, i) => {
        const isSelected = start + i === selected;
        const w = word(c);
        return (
          <Text key={`${c.plan ?? ''}/${c.check}`} inverse={isSelected} wrap="truncate-end">
            {isSelected ? pointer : ' '}
            {`${cell(label(c), checkWidth)}${cell(String(c.n), 6, 'right')}${cell(String(c.pass), 6, 'right')}${cell(String(c.marginal), 6, 'right')}${cell(String(c.fail), 6, 'right')}${cell(formatPercent(c.finalYield), 7, 'right')}${cell(formatIndex(c.cp), 6, 'right')}${cell(formatIndex(c.cpk), 6, 'right')}  `}
            <Text {...toneProps(w.tone)}>{cell(w.text, 15)}</Text>
          </Text>
        );
      })}
    </Box>
  );
}
