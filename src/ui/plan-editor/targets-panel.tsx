import { Box, Text } from 'ink';
import type { Target } from '../../analysis/types.js';
import { cell } from '../components/columns.js';
import { formatBand, formatNominal } from '../plan-screen/format-band.js';
import { toneProps } from '../theme.js';
import type { LiveTargets } from './use-live-targets.js';

export interface TargetsPanelProps {
  readonly live: LiveTargets;
  /** Show this stage's checks (`rails` for the rails); all when undefined. */
  readonly stage: string | undefined;
  readonly rows: number;
  readonly width: number;
}

function statusText(live: LiveTargets): string {
  if (live.status === 'checking') return 'computing…';
  if (live.status === 'problems')
    return `the plan has ${live.problems.length || 'a'} problem${live.problems.length === 1 ? '' : 's'}${live.isStale ? ': last targets, stale' : ''}`;
  if (live.status === 'refining') return `≈ estimated bands; worst case and statistical band refining ${Math.round(live.progress * 100)} %`;
  return live.error ? `⚠ ${live.error}` : 'statistical band done';
}

/** The live targets beside (or under) the form: check, nominal, worst-case band, statistical band when there is room, then the design warnings. */
export function TargetsPanel({ live, stage, rows, width }: TargetsPanelProps) {
  const all = live.set?.targets ?? [];
  const mine = stage === undefined ? all : all.filter((t) => t.stage === stage);
  const shown: readonly Target[] = mine.length > 0 ? mine : all;
  const warnings = live.set?.warnings ?? [];
  const showStat = width >= 70;
  const band = width >= 96 ? 24 : 22;
  const check = Math.max(12, width - 12 - band - (showStat ? band : 0) - 2);
  const tone = live.isStale || live.status === 'problems' ? toneProps('dim') : {};
  // The quick pass's bands are estimates from the sensitivities (TargetSet.isEstimate) until the worker's replace them;
  // a limit check's band is the plan's own (no estimate).
  const estimate = live.set?.isEstimate === true ? '≈ ' : '';
  // Title, column heads and the warnings line take three rows; a "more" line one when the rest does not fit.
  const room = Math.max(1, rows - 3);
  const hasMore = shown.length > room && room >= 2;
  const tableRows = hasMore ? room - 1 : room;
  return (
    <Box flexDirection="column" width={width}>
      <Text bold wrap="truncate-end">
        Targets{stage && mine.length > 0 ? ` of ${stage}` : ''} ({shown.length}){' '}
        <Text {...toneProps(live.status === 'problems' ? 'bad' : 'dim')}>· {statusText(live)}</Text>
      </Text>
      <Text wrap="truncate-end" {...toneProps('dim')}>
        {cell('check', check)}
        {cell('nominal', 12)}
        {cell('worst-case band', band)}
        {showStat ? cell('statistical band', band) : ''}
      </Text>
      {shown.length === 0
        ? live.problems.slice(0, tableRows).map((p) => (
            <Text key={p.path} wrap="truncate-end" {...toneProps('bad')}>
              ✗ {p.path || 'plan'}: {p.detail}
            </Text>
          ))
        : null}
      {shown.slice(0, tableRows).map((t) => (
        <Text key={t.check} wrap="truncate-end" {...tone}>
          {cell(t.check, check - 1)} {cell(formatNominal(t), 11)} {cell(`${t.isLimit ? '' : estimate}${formatBand(t.worst, t.unit)}`, band - 1)}{' '}
          {showStat
            ? cell(live.status === 'done' || estimate || t.isLimit ? `${t.isLimit ? '' : estimate}${formatBand(t.stat, t.unit)}` : 'refining…', band - 1)
            : ''}
        </Text>
      ))}
      {hasMore ? <Text {...toneProps('dim')}>… {shown.length - tableRows} more (select a stage to see its own)</Text> : null}
      <Text wrap="truncate-end" {...toneProps(live.problems[0] ? 'bad' : warnings.length > 0 ? 'warn' : 'good')}>
        {live.problems[0] && shown.length > 0
          ? `✗ ${live.problems[0].path || 'plan'}: ${live.problems[0].detail}`
          : warnings.length === 0
            ? live.set
              ? '✓ no design warnings'
              : ''
            : `⚠ ${warnings.length} warning${warnings.length === 1 ? '' : 's'}: ${warnings.map((w) => `${w.stage}: ${w.message}`).join(' · ')}`}
      </Text>
    </Box>
  );
}
