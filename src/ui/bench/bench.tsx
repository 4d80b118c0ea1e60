import { useEffect, useRef } from 'react';
import { Box, Text } from 'ink';
import type { ScreenProps } from '../screen-props.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar } from '../components/key-bar.js';
import { scrollWindow } from '../components/scroll-window.js';
import { toneProps } from '../theme.js';
import { BoardFilter } from './board-filter.js';
import { BoardList } from './board-list.js';
import { benchHelpFor, benchKeys } from './bench-help.js';
import { PlanChoices, SerialEntry } from './new-board.js';
import type { PlanCatalog } from './plan-catalog.js';
import { type BenchTargets, useBenchState } from './use-bench-state.js';
import { useBenchKeys } from './use-bench-keys.js';

export interface BenchProps extends ScreenProps {
  /** The plans, or a promise of them while they load: listing the boards needs none. */
  readonly catalog: PlanCatalog | Promise<PlanCatalog>;
  /** Where Enter, n, h, b and p lead. */
  readonly go: BenchTargets;
  /** The board to select on arrival (the one last opened). */
  readonly initialSerial?: string;
  /** Tell the app a text field has the keys, so `q` is a letter, not quit. */
  readonly onTypingChange?: (isTyping: boolean) => void;
  /** Tell the app which board is selected, so coming back selects it again. */
  readonly onSelect?: (serial: string) => void;
  /** Called when the boards are on screen (or the log could not be read). */
  readonly onLoaded?: () => void;
}

/** The bench screen: every board in the log, and the way into a run. */
export function BenchScreen({ log, catalog, go, width, height, isActive = true, initialSerial, onTypingChange, onSelect, onLoaded }: BenchProps) {
  const state = useBenchState(log, catalog, go, initialSerial, onSelect);
  const { mode, boards, selected, message } = state;
  const dialogRows = mode.kind === 'new-serial' ? 6 : mode.kind === 'choose-plan' ? mode.choices.length + 3 : mode.kind === 'confirm-run' ? 4 : 0;
  const listRows = Math.max(1, height - 5 - dialogRows - (state.damaged.length > 0 ? 1 : 0));
  const { typeAhead } = useBenchKeys(state, listRows, isActive, onTypingChange);
  const isTyping = mode.kind === 'new-serial' || mode.kind === 'filter';
  useEffect(() => onTypingChange?.(isTyping), [isTyping, onTypingChange]);
  useEffect(() => {
    if (!state.isLoading) onLoaded?.();
  }, [state.isLoading, onLoaded]);
  const start = useRef(0);
  const view = scrollWindow(boards.length, selected, listRows, start.current);
  start.current = view.start;

  if (mode.kind === 'help') {
    const help = benchHelpFor(mode.from);
    return <HelpBox title="bench" topic={help.topic} entries={help.entries} notes={help.notes} width={width} />;
  }
  const plural = (n: number) => (n === 1 ? '1 board' : `${n} boards`);
  const count = state.isLoading ? 'reading the log…' : state.filter ? `${boards.length} of ${plural(state.total)}` : plural(state.total);
  return (
    <Box flexDirection="column" width={width} height={height}>
      <Header screen="bench" detail={count} note={log.dir} width={width} isNoteTail />
      {state.isLoading && (boards.length === 0 || state.progress) ? (
        <Text>Reading the log index…{state.progress ? ` ${state.progress.done} of ${state.progress.total} board files re-read` : ''}</Text>
      ) : null}
      {state.damaged.length > 0 ? (
        <Text wrap="truncate-end" {...toneProps('bad')}>
          ✗ {state.damaged.length === 1 ? '1 board file cannot be read' : `${state.damaged.length} board files cannot be read`} (left untouched):{' '}
          {state.damaged[0]?.message}
        </Text>
      ) : null}
      {state.loadError ? <Text {...toneProps('bad')}>✗ {state.loadError}</Text> : null}
      {!state.isLoading && state.total === 0 ? (
        <Text>No boards in this log yet. Press n to enter the first board’s serial.</Text>
      ) : (
        <BoardList boards={boards} start={view.start} rows={listRows} selected={selected} width={width} />
      )}
      {mode.kind === 'new-serial' ? (
        <SerialEntry
          isActive={isActive}
          onHelp={() => state.setMode({ kind: 'help', from: mode })}
          onSubmit={state.submitSerial}
          onChange={() => state.setMessage(null)}
          onCancel={() => state.setMode({ kind: 'list' })}
          typeAhead={typeAhead}
        />
      ) : null}
      {mode.kind === 'choose-plan' ? <PlanChoices serial={mode.serial} choices={mode.choices} selected={mode.selected} width={width} /> : null}
      {mode.kind === 'confirm-run' ? (
        <Box flexDirection="column" borderStyle="single" paddingX={1}>
          <Text wrap="truncate-end">
            Start a new run on {mode.board.serial} ({mode.board.state}, {mode.board.runs} runs so far) with plan {mode.plan.plan}?
          </Text>
          <Text {...toneProps('dim')}>Enter or y: start · Esc or n: cancel · ?: help</Text>
        </Box>
      ) : null}
      {mode.kind === 'filter' ? (
        <BoardFilter
          initial={state.filter}
          onHelp={() => state.setMode({ kind: 'help', from: mode })}
          onChange={state.setFilter}
          onDone={() => state.setMode({ kind: 'list' })}
          isActive={isActive}
          typeAhead={typeAhead}
        />
      ) : null}
      {mode.kind === 'busy' ? <Text>{mode.what}</Text> : null}
      {message ? (
        <Text wrap="truncate-end" {...toneProps(message.tone === 'error' ? 'bad' : 'accent')}>
          {message.tone === 'error' ? '✗ ' : ''}
          {message.text}
        </Text>
      ) : null}
      <Box flexGrow={1} />
      <KeyBar hints={benchKeys} width={width} />
    </Box>
  );
}
