import { Box, Text } from 'ink';
import { memo } from 'react';
import type { Target } from '../../analysis/types.js';
import { currentReading, lockReason } from '../../run/gates.js';
import type { RunState } from '../../run/types.js';
import { cell } from '../components/columns.js';
import { scrollWindow } from '../components/scroll-window.js';
import { pointer, type Tone, toneProps, verdictMark, verdictTone } from '../theme.js';

export interface StageListProps {
  readonly state: RunState;
  /** Index into `state.targets` of the list cursor. */
  readonly cursor: number;
  /** Whether the list has the keyboard (cursor shown). @default false */
  readonly isFocused?: boolean;
  readonly width: number;
  /** Rows available. */
  readonly height: number;
}

/** Marks beside a check: its verdict, or `↻` to measure again, `·` not yet, `⊘` locked by a safety gate. */
export function checkMark(state: RunState, target: Target): { mark: string; tone: Tone } {
  const r = currentReading(state, target.check);
  if (r) return { mark: verdictMark[r.verdict], tone: verdictTone[r.verdict] };
  if (state.stale.has(target.check)) return { mark: '↻', tone: 'accent' };
  if (lockReason({ ...state, isCautionsPending: false, isPowerOff: false }, target.check)) return { mark: '⊘', tone: 'dim' };
  return { mark: '·', tone: 'dim' };
}

type Row = { readonly heading: string } | { readonly index: number };

/** The checks grouped by stage, each with its mark; scrolls to keep the cursor in view. */
function StageListView({ state, cursor, isFocused = false, width, height }: StageListProps) {
  const rows: Row[] = [];
  let stage = '';
  state.targets.forEach((t, index) => {
    if (t.stage !== stage) {
      stage = t.stage;
      rows.push({ heading: stage });
    }
    rows.push({ index });
  });
  const at = Math.max(
    0,
    rows.findIndex((r) => 'index' in r && r.index === cursor),
  );
  // Keep a third of the rows above the cursor in view: its stage heading and what was just measured.
  const { start, end } = scrollWindow(rows.length, at, height, Math.max(0, at - Math.floor(height / 3)));
  return (
    <Box flexDirection="column" width={width} flexShrink={0}>
      {rows.slice(start, end).map((row, i) => {
        if ('heading' in row) {
          return (
            <Text key={`h-${row.heading}-${i}`} bold {...toneProps('title')}>
              {cell(row.heading, width)}
            </Text>
          );
        }
        const t = state.targets[row.index] as Target;
        const { mark, tone } = checkMark(state, t);
        const label = t.check.slice(t.stage.length + 1);
        const isCursor = isFocused && row.index === cursor;
        const isSelected = t.check === state.selected;
        return (
          <Text key={t.check} inverse={isCursor} bold={isSelected}>
            {isCursor ? pointer : isSelected ? '▸' : ' '}
            <Text {...toneProps(tone)}>{mark}</Text> {cell(label, width - 3)}
          </Text>
        );
      })}
    </Box>
  );
}

/** Memoised: typing in the input line leaves the list as it is, so it is not rendered again. */
export const StageList = memo(StageListView);
