import { Box, Text } from 'ink';
import { toneProps } from '../theme.js';
import { cautions, powerOffSteps, shortCautions } from './cautions.js';

/** The cautions at the start of a sitting; Enter acknowledges them. */
export function CautionsPanel({ width, height, isResumed }: { readonly width: number; readonly height: number; readonly isResumed: boolean }) {
  // Full text when it fits wrapped in the box, else the short forms: never cut a caution off mid-sentence.
  const inner = Math.max(10, width - 6);
  const rowsOf = (list: readonly string[]) => list.reduce((n, c) => n + Math.ceil((c.length + 2) / inner), 0);
  const isFull = rowsOf(cautions) + 5 <= height;
  const shown = isFull ? cautions : shortCautions;
  const isWrapped = isFull || rowsOf(shortCautions) + 5 <= height;
  return (
    <Box flexDirection="column" borderStyle="double" paddingX={1} width={width}>
      <Text bold {...toneProps('warn')}>
        ! Cautions before first power{isResumed ? ' (resumed run: check the bench again)' : ''}
      </Text>
      {shown.map((c) => (
        <Text key={c} wrap={isWrapped ? 'wrap' : 'truncate-end'}>
          • {c}
        </Text>
      ))}
      <Text bold wrap="truncate-end">
        {width >= 80 ? 'Enter: I have read these — start with the unpowered checks · Esc: back' : 'Enter: read — start unpowered checks · Esc: back'}
      </Text>
    </Box>
  );
}

/** The stop after an idle current above its limit; Enter once power is off. */
export function PowerOffPanel({ width, reading }: { readonly width: number; readonly reading: string }) {
  return (
    <Box flexDirection="column" borderStyle="double" paddingX={1} width={width}>
      <Text bold {...toneProps('bad')}>
        ✗ POWER OFF — idle current {reading} is above the limit
      </Text>
      {powerOffSteps.map((s, i) => (
        <Text key={s} wrap="truncate-end">
          {i + 1}. {s}
        </Text>
      ))}
      <Text bold>Enter: power is off — continue with the unpowered checks</Text>
    </Box>
  );
}

/** The offer to end the run, with the outcomes allowed now. */
export function EndPanel({
  options,
  cursor,
  width,
  isAllMeasured,
}: {
  readonly options: readonly string[];
  readonly cursor: number;
  readonly width: number;
  readonly isAllMeasured: boolean;
}) {
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1} width={width}>
      <Text bold {...toneProps('title')}>
        End the run{isAllMeasured ? ': every check has a reading' : ' (checks still open)'}
      </Text>
      {options.map((o, i) => (
        <Text key={o} inverse={i === cursor}>
          {i === cursor ? '›' : ' '} {o}
        </Text>
      ))}
      <Text {...toneProps('dim')}>↑↓ choose · Enter ends the run · Esc keeps it open</Text>
    </Box>
  );
}
