import { Box, Text } from 'ink';
import { memo } from 'react';
import type { Diagnosis } from '../../analysis/diagnose.js';
import { toneProps } from '../theme.js';

export interface DiagnosisPanelProps {
  readonly diagnosis: Diagnosis;
  /** The stage's fault hints for the failed check: text under the ranked list (nobody verified them). */
  readonly hints: readonly string[];
  /** Lines available: hypotheses first, then the check that separates them, then the unexplained. */
  readonly maxLines: number;
  readonly width: number;
}

/**
 * The likely faults after a fail, in bench words with the part's designator,
 * most likely first (the check that best separates them is the screen's next line).
 */
function DiagnosisPanelView({ diagnosis, hints, maxLines, width }: DiagnosisPanelProps) {
  const lines: { key: string; text: string; tone?: 'dim' | 'warn' | 'accent' }[] = [];
  diagnosis.hypotheses.slice(0, 3).forEach((h) => {
    const also =
      h.alternatives.length > 0 ? ` (or ${h.alternatives.map((a) => (a.part === h.part && a.variantWords ? a.variantWords : a.part)).join(', ')})` : '';
    lines.push({ key: `h${h.rank}`, text: `${h.rank}. ${Math.round(h.score * 100)} % ${h.short}${also}` });
  });
  if (diagnosis.hypotheses.length === 0 && diagnosis.unexplained.length > 0) {
    lines.push({ key: 'none', text: 'no single fault reproduces these readings: two faults, a model limit or a slip of the probe?', tone: 'warn' });
  }
  const separate = diagnosis.hypotheses[0]?.separate;
  if (separate) lines.push({ key: 'sep', text: separate, tone: 'dim' });
  if (diagnosis.hypotheses.length > 0) lines.push({ key: 'rw', text: 'r starts a rework note from hypothesis 1', tone: 'dim' });
  for (const h of hints.slice(0, 2)) lines.push({ key: `hint ${h}`, text: `hint: ${h}`, tone: 'dim' });
  return (
    <Box flexDirection="column" width={width}>
      {lines.slice(0, Math.max(0, maxLines)).map((l) => (
        <Text key={l.key} wrap="truncate-end" {...(l.tone ? toneProps(l.tone) : {})}>
          {l.text}
        </Text>
      ))}
    </Box>
  );
}

/** Memoised: it changes with each reading, not with each key typed. */
export const DiagnosisPanel = memo(DiagnosisPanelView);
