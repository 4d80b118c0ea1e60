import { Box, Text } from 'ink';
import { useEffect } from 'react';
import { describeFilter } from '../../review/filter.js';
import { formatFigure, formatPercent } from '../../review/format.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar } from '../components/key-bar.js';
import type { BatchProps } from '../screen-props.js';
import { toneProps } from '../theme.js';
import { BatchProgress, problemLine } from './batch-progress.js';
import { batchHelp, batchHints, batchNotes, filterFormHelp, filterFormNotes } from './batch-help.js';
import { BatchPanel } from './batch-panel.js';
import { BatchTable, checkLabeller } from './batch-table.js';
import { FilterForm } from './filter-form.js';
import { useBatchKeys } from './use-batch-keys.js';
import { batchPanels, selectedCheck, useBatchState } from './use-batch-state.js';

const panelLabel = { histogram: 'Histogram', trend: 'Trend', outliers: 'Outliers' } as const;

/** Every check across the boards: yield, spread, capability, with histogram, trend and outliers. */
export function BatchScreen({ log, width, height, isActive = true, onExit, onOpenBoard, onTypingChange, catalog, targetsCache }: BatchProps) {
  const { state, dispatch } = useBatchState(log, catalog, targetsCache);
  const isTyping = state.form !== null && state.form !== undefined;
  useEffect(() => onTypingChange?.(isTyping), [isTyping, onTypingChange]);
  const rest = Math.max(6, height - 6);
  const tableRows = Math.max(2, Math.min(state.rows.length, Math.floor(rest * 0.35)));
  const panelRows = Math.max(4, rest - tableRows);
  const { cursor, isFormHelpOpen } = useBatchKeys(state, dispatch, { onExit, onOpenBoard, onTypingChange }, tableRows, isActive);
  const figures = state.figures;
  const check = selectedCheck(state);
  const note = figures ? `${figures.boards} boards · first-pass ${formatPercent(figures.firstPassYield)} · final ${formatPercent(figures.finalYield)}` : '';
  let body;
  if (state.isHelpOpen) body = <HelpBox title="batch" entries={batchHelp} notes={batchNotes} width={width} />;
  else if (state.form && isFormHelpOpen)
    body = <HelpBox title="batch" topic="the filter form" entries={filterFormHelp} notes={filterFormNotes} width={width} />;
  else if (state.form) body = <FilterForm form={state.form} cursor={cursor} width={width} />;
  else if (state.status === 'error') body = <Text {...toneProps('bad')}>Cannot review the batch: {state.message}</Text>;
  else if (state.status !== 'ready' || !figures) body = <BatchProgress state={state} />;
  else if (!check) body = <Text>No readings match {describeFilter(state.filter)}. Press f to change the filter, or record readings first.</Text>;
  else
    body = (
      <>
        <BatchTable rows={state.rows} selected={state.selected} height={tableRows} width={width} />
        <Text wrap="truncate-end">
          {`${checkLabeller(state.rows)(check)}: mean ${formatFigure(check.mean, check.unit)} · sd ${formatFigure(check.sd, check.unit, 3)} · min ${formatFigure(check.min, check.unit)} · max ${formatFigure(check.max, check.unit)}`}
        </Text>
        <Text wrap="truncate-end">
          {batchPanels.map((p) => (
            <Text key={p} inverse={p === state.panel} bold={p === state.panel}>
              {p === state.panel
                ? `[${panelLabel[p]}${p === 'outliers' ? ` (${check.outliers.length})` : ''}]`
                : ` ${panelLabel[p]}${p === 'outliers' ? ` (${check.outliers.length})` : ''} `}
            </Text>
          ))}
          <Text {...toneProps('dim')}>{check.note ? `  ${check.note}` : ''}</Text>
        </Text>
        <BatchPanel check={check} panel={state.panel} outlierSelected={state.outlierSelected} height={panelRows - 2} width={width} />
      </>
    );
  return (
    <Box flexDirection="column" width={width} height={height}>
      <Header screen="batch" detail={describeFilter(state.filter)} note={note} width={width} />
      {figures && figures.problems.length > 0 ? (
        <Text {...toneProps('warn')} wrap="truncate-end">
          ! {problemLine(figures.problems)}
        </Text>
      ) : null}
      <Box flexDirection="column" flexGrow={1}>
        {body}
      </Box>
      <KeyBar hints={batchHints} width={width} />
    </Box>
  );
}
