import { Box, Text } from 'ink';
import { memo } from 'react';
import type { Target, VerdictResult } from '../../analysis/types.js';
import type { RunReading } from '../../run/types.js';
import { formatPercent, formatValue } from '../../units/format.js';
import type { Unit } from '../../units/unit.js';
import { toneProps, verdictMark, verdictTone } from '../theme.js';
import { bandGauge, formatBand, formatReading } from './format-band.js';

/** One explanation of a deviation, as `explainReading` ranks them. */
export interface ExplanationView {
  readonly part: string;
  readonly unit: Unit;
  readonly fitted: number;
  readonly wouldBe: number;
  readonly likely: string;
  readonly note: string;
}

export interface VerdictPanelProps {
  readonly reading: RunReading;
  readonly target: Target;
  readonly result: VerdictResult;
  readonly explanations: readonly ExplanationView[];
  readonly hints: readonly string[];
  /** Lines available; explanations, then hints, are shortened to fit. */
  readonly maxLines: number;
  readonly width: number;
}

const likelyWord: Readonly<Record<string, string>> = {
  'x10-slip': '×10 slip',
  'neighbour-value': 'neighbouring value',
  'standard-value': 'standard value',
  drift: 'drift or damage',
};

function position(result: VerdictResult): string {
  const p = result.position;
  if (Number.isNaN(p)) return '';
  if (p < 0) return Number.isFinite(p) ? `below the band by ${Math.round(-p * 100)} % of its width` : 'below the band';
  if (p > 1) return Number.isFinite(p) ? `above the band by ${Math.round((p - 1) * 100)} % of its width` : 'above the band';
  return `${Math.round(p * 100)} % into the band`;
}

/** The verdict on the latest reading: word and mark, deviation, and on a fail or marginal the likely causes. */
function VerdictPanelView({ reading, target, result, explanations, hints, maxLines, width }: VerdictPanelProps) {
  // A one-sided band (a limit, such as ≥ 100 Ω to ground or ≤ 30 mA idle) has no width to sit in.
  const isLimit = !Number.isFinite(target.worst.min) || !Number.isFinite(target.worst.max) || (target.worst.min === 0 && target.phase === 'first-power');
  const gauge = isLimit ? null : bandGauge(result.position);
  const where = isLimit
    ? `${reading.verdict === 'pass' ? 'within' : reading.verdict === 'fail' ? 'beyond' : 'at'} the limit ${formatBand(target.worst, target.unit)}`
    : `deviation ${formatPercent(Math.abs(result.deviation) < 1e-9 ? 0 : result.deviation)} · ${position(result)}`;
  const head = 2 + (result.warnings.length > 0 ? 1 : 0);
  const room = Math.max(0, maxLines - head);
  const shownExplanations = explanations.slice(0, Math.min(3, hints.length > 0 ? Math.max(1, room - 1) : room));
  const shownHints = hints.slice(0, Math.max(0, room - shownExplanations.length));
  return (
    <Box flexDirection="column" width={width}>
      <Text wrap="truncate-end">
        <Text bold {...toneProps(verdictTone[reading.verdict])}>
          {verdictMark[reading.verdict]} {reading.verdict.toUpperCase()}
        </Text>{' '}
        {reading.check} = {formatReading(reading.value, reading.unit)}{' '}
        <Text {...toneProps('dim')}>(±{formatValue(result.uncertainty, target.unit, { digits: 3 })}) saved ✓</Text>
      </Text>
      <Text wrap="truncate-end">
        {gauge ? `${gauge} ` : ''}
        {where}
      </Text>
      {result.warnings.slice(0, 1).map((w) => (
        <Text key={w} wrap="truncate-end" {...toneProps('warn')}>
          ! {w}
        </Text>
      ))}
      {shownExplanations.map((e) => (
        <Text key={e.part} wrap="truncate-end">
          • {e.part} {likelyWord[e.likely] ?? e.likely}: would be {formatValue(e.wouldBe, e.unit, { digits: 3 })} (fitted{' '}
          {formatValue(e.fitted, e.unit, { digits: 3 })})
        </Text>
      ))}
      {shownHints.map((h) => (
        <Text key={h} wrap="truncate-end" {...toneProps('dim')}>
          hint: {h}
        </Text>
      ))}
    </Box>
  );
}

/** Memoised: it changes with each reading, not with each key typed. */
export const VerdictPanel = memo(VerdictPanelView);
