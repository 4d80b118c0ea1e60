import { Box, Text } from 'ink';
import type { Target } from '../../analysis/types.js';
import { toneProps } from '../theme.js';
import { formatBand, formatContributor, formatNominal, phaseWord } from './format-band.js';

export interface TargetDetailProps {
  readonly target: Target;
  readonly width: number;
  /** Designators by part, from the plan's `refs`. */
  readonly refs?: ReadonlyMap<string, string>;
}

/** Everything about the selected target, in four short lines. */
export function TargetDetail({ target: t, width, refs }: TargetDetailProps) {
  const shares = t.contributors
    .slice(0, 4)
    .map((c) => formatContributor(c, refs))
    .join(', ');
  return (
    <Box flexDirection="column" width={width}>
      <Text wrap="truncate-end">
        <Text bold>{t.check}</Text> · {t.quantity} · {phaseWord[t.phase]} · {t.instrument}
        {t.testPoint ? ` at ${t.testPoint}` : ''} · nominal {formatNominal(t)}
      </Text>
      <Text wrap="truncate-end">
        worst case {formatBand(t.worst, t.unit)} · statistical {formatBand(t.stat, t.unit)}
      </Text>
      <Text wrap="truncate-end">how: {t.how}</Text>
      <Text wrap="truncate-end" {...toneProps('dim')}>
        contributors: {shares || 'none (a fixed limit, no parts behind it)'}
      </Text>
    </Box>
  );
}
