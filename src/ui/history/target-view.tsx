import { Box, Text } from 'ink';
import type { SnapshotBands } from '../../review/bands.js';
import type { TimelineEntry } from '../../review/history.js';
import { formatPercent, formatValue } from '../../units/format.js';
import { toneProps, verdictMark, verdictTone } from '../theme.js';
import { shortTime } from './timeline-lines.js';

export interface TargetViewProps {
  readonly entry: Extract<TimelineEntry, { kind: 'reading' }>;
  readonly bands: ReadonlyMap<string, SnapshotBands>;
}

/** A reading beside its target as it was when measured (the plan snapshot by the reading's hash). */
export function TargetView({ entry, bands }: TargetViewProps) {
  const r = entry.reading;
  const t = entry.target;
  const snapshot = bands.get(r.planHash);
  const show = (v: number) => formatValue(v, r.unit);
  const width = t ? t.worst.max - t.worst.min : NaN;
  const position = t && Number.isFinite(width) && width > 0 ? (r.value - t.worst.min) / width : null;
  return (
    <Box flexDirection="column" borderStyle="single" paddingX={1}>
      <Text bold {...toneProps('title')}>
        Target as it was when measured
      </Text>
      <Text>{`check        ${r.check}${t?.testPoint ? `   at test point ${t.testPoint}` : ''}`}</Text>
      <Text>{`plan         ${snapshot ? snapshot.plan : '?'}, revision ${r.planHash.slice(0, 12)}`}</Text>
      {t ? (
        <>
          <Text>{`nominal      ${show(t.nominal)}`}</Text>
          <Text>{`worst-case   ${show(t.worst.min)} … ${show(t.worst.max)}`}</Text>
          <Text>{`statistical  ${show(t.stat.min)} … ${show(t.stat.max)}`}</Text>
          <Text wrap="truncate-end">{`how          ${t.how}`}</Text>
        </>
      ) : (
        <Text {...toneProps('warn')}>The plan snapshot {r.planHash.slice(0, 12)} is not in the log, or has no such check: the target cannot be shown.</Text>
      )}
      <Text> </Text>
      <Text wrap="truncate-end">{`reading      ${r.id}, typed "${r.raw}"`}</Text>
      <Text wrap="truncate-end">{`when         ${shortTime(r.at)} UTC by ${r.operator}`}</Text>
      <Text {...toneProps(verdictTone[r.verdict])}>
        {`value        ${show(r.value)}  ${verdictMark[r.verdict]} ${r.verdict}`}
        {entry.deviation !== null ? `  deviation ${formatPercent(entry.deviation)}` : ''}
        {position !== null ? `  at ${(position * 100).toFixed(0)} % of the band` : ''}
      </Text>
      {(r.warnings ?? []).map((w) => (
        <Text key={w} wrap="truncate-end" {...toneProps('warn')}>
          ! {w}
        </Text>
      ))}
      {r.capture ? <Text {...toneProps('dim')}>c draws the capture {r.capture}</Text> : null}
      <Text {...toneProps('dim')}>Esc back to the timeline</Text>
    </Box>
  );
}
