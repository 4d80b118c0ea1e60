import { useMemo, useRef } from 'react';
import { Box, Text } from 'ink';
import type { TargetSet } from '../../analysis/types.js';
import { refsOfPlanText } from '../../plan/refs.js';
import type { Plan } from '../../plan/types.js';
import type { ScreenProps } from '../screen-props.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar } from '../components/key-bar.js';
import { scrollWindow } from '../components/scroll-window.js';
import { toneProps } from '../theme.js';
import { planEditNote, planHelp, planKeys, planNotes } from './plan-help.js';
import { TargetDetail } from './target-detail.js';
import { TargetsTable } from './targets-table.js';
import { usePlanScreenKeys } from './use-plan-screen-keys.js';
import { usePlanScreenState } from './use-plan-screen-state.js';

export interface PlanScreenProps extends Omit<ScreenProps, 'log'> {
  readonly plan: Plan;
  readonly targets: TargetSet;
  /** Open this plan in the plan editor (`e`); without it the key is not offered. */
  readonly onEdit?: () => void;
}

/** The plan screen: every target with its bands and top contributor, and the design warnings. */
export function PlanScreen({ plan, targets, width, height, isActive = true, onExit, onEdit }: PlanScreenProps) {
  const warnings = targets.warnings;
  const warningRows = warnings.length === 0 ? 1 : Math.min(warnings.length, Math.max(2, Math.floor(height / 6)));
  const tableRows = Math.max(1, height - 1 - (1 + warningRows) - 1 - 4 - 1);
  const state = usePlanScreenState(targets.targets.length, warnings.length, warningRows);
  usePlanScreenKeys(state, tableRows, onExit, isActive, onEdit);
  const start = useRef(0);
  const view = scrollWindow(targets.targets.length, state.selected, tableRows, start.current);
  start.current = view.start;
  const target = targets.targets[state.selected];
  const refs = useMemo(() => refsOfPlanText(plan.text), [plan.text]);

  if (state.isHelpOpen)
    return (
      <HelpBox
        title="plan"
        entries={onEdit ? planHelp : planHelp.filter(([k]) => k !== 'e')}
        notes={onEdit ? [...planNotes, planEditNote] : planNotes}
        width={width}
      />
    );
  const warnFocus = state.panel === 'warnings';
  return (
    <Box flexDirection="column" width={width} height={height}>
      <Header screen="plan" detail={`${plan.plan} — ${plan.title}`} note={`${targets.targets.length} checks`} width={width} />
      <Text bold inverse={warnFocus}>
        Design warnings ({warnings.length}){warnFocus ? ' — ↑↓ scroll, Tab back to the targets' : ''}
      </Text>
      {warnings.length === 0 ? <Text {...toneProps('good')}>✓ none: no stage reports a problem at nominal values</Text> : null}
      {warnings.slice(state.warningStart, state.warningStart + warningRows).map((w, i) => (
        <Text key={`${state.warningStart + i}`} wrap="truncate-end" {...toneProps('warn')}>
          ⚠ {w.stage}: {w.message}
        </Text>
      ))}
      <TargetsTable targets={targets.targets} start={view.start} rows={tableRows} selected={state.selected} width={width} isFocused={!warnFocus} refs={refs} />
      {target ? <TargetDetail target={target} width={width} refs={refs} /> : <Text>This plan has no checks.</Text>}
      <Box flexGrow={1} />
      <KeyBar hints={onEdit ? planKeys : planKeys.filter(([k]) => k !== 'e')} width={width} />
    </Box>
  );
}
