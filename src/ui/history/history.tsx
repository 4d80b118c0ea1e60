import { Box, Text } from 'ink';
import { historyCounts } from '../../review/history.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar } from '../components/key-bar.js';
import type { HistoryProps } from '../screen-props.js';
import { toneProps } from '../theme.js';
import { CaptureView } from './capture-view.js';
import { historyHelp, historyHints, historyNotes } from './history-help.js';
import { ReworkPanel } from './rework-panel.js';
import { TargetView } from './target-view.js';
import { TimelineList } from './timeline-list.js';
import { useHistoryKeys } from './use-history-keys.js';
import { selectedEntry, useHistoryState } from './use-history-state.js';

/** One board's history: timeline, rework before/after, a reading's target as measured. */
export function HistoryScreen({ log, serial, width, height, isActive = true, onExit, catalog, targetsCache }: HistoryProps) {
  const { state, dispatch } = useHistoryState(log, serial, catalog, targetsCache);
  const rows = Math.max(3, height - 5);
  useHistoryKeys(state, dispatch, onExit, rows, isActive);
  const data = state.data;
  const entry = selectedEntry(state);
  const counts = data ? historyCounts(data.board) : null;
  const note = counts ? `${counts.runs} runs · ${counts.readings} readings (${counts.fail} fail) · ${counts.rework} rework` : '';
  let body;
  if (state.isHelpOpen) body = <HelpBox title="history" entries={historyHelp} notes={historyNotes} width={width} />;
  else if (state.status === 'loading')
    body = (
      <Box flexDirection="column">
        <Text wrap="truncate-end">{state.progress ?? `Reading the board file of ${serial}…`}</Text>
        {state.progress ? <Text {...toneProps('dim')}>Computed once per plan revision, then kept in the targets cache · Esc back · ? help</Text> : null}
      </Box>
    );
  else if (state.status === 'missing')
    body = (
      <Text>
        No board {serial} in the log {log.dir}. Press Esc.
      </Text>
    );
  else if (state.status === 'error')
    body = (
      <Text {...toneProps('bad')}>
        Cannot read board {serial}: {state.message}
      </Text>
    );
  else if (!data) body = null;
  else if (state.view === 'target' && entry?.kind === 'reading') body = <TargetView entry={entry} bands={data.bands} />;
  else if (state.view === 'capture' && entry && (entry.kind === 'capture' || entry.kind === 'reading'))
    body = <CaptureView log={log} file={entry.kind === 'capture' ? entry.capture.file : (entry.reading.capture ?? null)} width={width} height={rows} />;
  else if (state.panel === 'rework') body = <ReworkPanel board={data.board} selected={state.reworkSelected} rows={rows} width={width} />;
  else body = <TimelineList entries={data.timeline} selected={state.selected} rows={rows} width={width} />;
  const tabs =
    state.view === 'list' && data ? (
      <Text>
        <Text bold={state.panel === 'timeline'} inverse={state.panel === 'timeline'}>
          {state.panel === 'timeline' ? '[Timeline]' : ' Timeline '}
        </Text>{' '}
        <Text bold={state.panel === 'rework'} inverse={state.panel === 'rework'}>
          {state.panel === 'rework' ? `[Rework before/after (${data.board.rework.length})]` : ` Rework before/after (${data.board.rework.length}) `}
        </Text>
        <Text {...toneProps('dim')}> times UTC</Text>
      </Text>
    ) : null;
  return (
    <Box flexDirection="column" width={width} height={height}>
      <Header screen="history" detail={serial} note={note} width={width} />
      {tabs}
      {data && data.problems.length > 0 ? (
        <Text {...toneProps('warn')} wrap="truncate-end">
          ! {data.problems[0]}
        </Text>
      ) : null}
      <Box flexDirection="column" flexGrow={1}>
        {body}
      </Box>
      <KeyBar hints={historyHints} width={width} />
    </Box>
  );
}
