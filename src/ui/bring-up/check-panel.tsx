import { Box, Text } from 'ink';
import { memo } from 'react';
import type { Target } from '../../analysis/types.js';
import { uncertaintyFor } from '../../analysis/verdict.js';
import type { Plan } from '../../plan/types.js';
import type { ScopeSetup } from '../../run/scope-setup.js';
import { formatValue } from '../../units/format.js';
import { uncertaintyOf } from '../../units/uncertainty.js';
import { toneProps } from '../theme.js';
import { formatBand } from './format-band.js';

export interface CheckPanelProps {
  readonly plan: Plan;
  readonly target: Target;
  readonly scope: ScopeSetup | null;
  /** Why the check cannot be measured now, or null. */
  readonly lock: string | null;
  readonly width: number;
}

/** The guard band as the plan's instrument spec gives it at the nominal value. */
function guardBand(plan: Plan, target: Target): string {
  const spec = uncertaintyFor(plan, target.check, target.unit);
  if (!spec) return 'guard band: none (no instrument uncertainty in the plan)';
  if (!Number.isFinite(target.nominal)) return `guard band U = ${(spec.relative * 100).toPrecision(2)} % + ${formatValue(spec.absolute, target.unit)}`;
  return `guard band U = ±${formatValue(uncertaintyOf(target.nominal, spec), target.unit, { digits: 3 })} at nominal`;
}

/** The current check: where and how to measure it, and what it should read. */
function CheckPanelView({ plan, target, scope, lock, width }: CheckPanelProps) {
  const where = target.testPoint ? `at ${target.testPoint}` : 'no test point';
  const nominal = Number.isFinite(target.nominal) ? formatValue(target.nominal, target.unit) : '—';
  const isLimit = !Number.isFinite(target.worst.min) || !Number.isFinite(target.worst.max);
  return (
    <Box flexDirection="column" width={width}>
      <Text bold wrap="truncate-end">
        {target.check} · {target.quantity} · {where} · {target.instrument}
      </Text>
      <Text wrap="truncate-end" {...toneProps('dim')}>
        how: {target.how}
      </Text>
      <Text wrap="truncate-end">
        {isLimit
          ? `limit ${formatBand(target.worst, target.unit)} (a safety limit, no nominal)`
          : `nominal ${nominal} · worst-case ${formatBand(target.worst, target.unit)}`}
      </Text>
      <Text wrap="truncate-end">
        statistical {formatBand(target.stat, target.unit)} · {guardBand(plan, target)}
      </Text>
      {scope ? (
        <Text wrap="truncate-end">
          scope: {formatValue(scope.timePerDiv, 's', { digits: 3 })}/div · {formatValue(scope.voltsPerDiv, 'V', { digits: 3 })}/div (two periods, 10×8 div)
        </Text>
      ) : null}
      {lock ? (
        <Text wrap="truncate-end" {...toneProps('warn')}>
          ⊘ locked: {lock}
        </Text>
      ) : null}
    </Box>
  );
}

/** Memoised: it changes with the check, not with each key typed. */
export const CheckPanel = memo(CheckPanelView);
