import { Box, Text } from 'ink';
import { memo, useMemo } from 'react';
import { endOptions, openChecks } from '../../run/gates.js';
import { traceChart } from '../charts/trace.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar, type KeyHint } from '../components/key-bar.js';
import type { BringUpProps } from '../screen-props.js';
import { toneProps } from '../theme.js';
import { bringUpHelpFor } from './bring-up-help.js';
import { CaptureSlot } from './capture-slot.js';
import { CheckPanel } from './check-panel.js';
import { formatReading } from './format-band.js';
import { InputLine } from './input-line.js';
import { bringUpLayout } from './layout.js';
import { reworkDefaults } from './rework-defaults.js';
import { ReworkForm } from './rework-form.js';
import { CautionsPanel, EndPanel, PowerOffPanel } from './safety-panels.js';
import { StageList } from './stage-list.js';
import { useBringUpKeys } from './use-bring-up-keys.js';
import { useBringUpScreenState } from './use-bring-up-screen-state.js';
import { knownParts, useBringUpState } from './use-bring-up-state.js';
import { useCheckFigures } from './use-check-figures.js';
import { VerdictPanel } from './verdict-panel.js';

const MemoHeader = memo(Header);
const MemoKeyBar = memo(KeyBar);
const keyHints: readonly KeyHint[] = [['Tab', 'list/input'], ['r', 'rework'], ['a', 'capture'], ['e', 'end run'], ['Esc', 'back'], ['?', 'help']];

/** The bring-up screen: walks one board through every check in a safe order. */
export function BringUpScreen(props: BringUpProps) {
  const { plan, targets, serial, width, height, isActive = true, onExit } = props;
  const run = useBringUpState(props);
  const { state, target, status, lastTarget, explanation } = run;
  const ui = useBringUpScreenState(run, { onExit, onDirtyChange: props.onDirtyChange, onTypingChange: props.onTypingChange, reworkDefaults: () => reworkDefaults(plan, run.explanationRef.current.explanations) });
  useBringUpKeys(run, ui, isActive);
  const { focus } = ui.screen;
  const { trace, shape, scope, verdict, lock } = useCheckFigures(plan, targets, state, target, lastTarget);
  const last = state.last;
  const checkRows = 4 + (scope ? 1 : 0) + (lock ? 1 : 0);
  const verdictRows = verdict ? 2 + Math.min(3, explanation.explanations.length) + Math.min(2, explanation.hints.length) + (verdict.warnings.length > 0 ? 1 : 0) : 0;
  const labelWidth = Math.max(...state.targets.map((t) => t.check.length - t.stage.length - 1), 8);
  const layout = bringUpLayout(width, height, checkRows, verdictRows, labelWidth);
  const done = state.targets.length - openChecks(state).length;
  const isOverlay = focus === 'rework' || focus === 'end' || focus === 'capture';
  const { captured } = run;
  // Drawn again only when the check, the size or a capture changes, not on every keystroke.
  const chart = useMemo(
    () => (trace && layout.traceRows > 0 && !isOverlay ? traceChart(trace.samples, captured(trace.output, trace.samples), { width: layout.panelWidth, height: layout.traceRows, ...(trace.band ? { band: trace.band } : {}) }) : null),
    [trace, layout.traceRows, layout.panelWidth, isOverlay, captured],
  );
  const next = state.suggestion;
  const nextLine = state.ended
    ? `run ended: ${state.ended} · Esc back to the bench`
    : next
      ? `next: ${next.check} — ${next.why}${next.check === state.selected ? '' : ' (Enter)'}`
      : 'every check has a reading: e ends the run';
  const source = target ? run.instrumentFor(target.check, target.unit, target.captureFigure) : null;
  const placeholder = `${next && next.check !== state.selected ? 'type a reading, or Enter for the next check' : 'type a reading'}${source ? `; m reads ${source.name} (${source.query})` : ''}`;
  const body = (() => {
    if (focus === 'help') {
      const help = bringUpHelpFor(ui.screen.helpFrom, state.isPowerOff);
      return <HelpBox title="bring-up" topic={help.topic} entries={help.entries} notes={help.notes} width={width} />;
    }
    if (status.kind !== 'loading' && state.isCautionsPending && !state.ended) return <CautionsPanel width={width} height={layout.bodyRows} isResumed={state.readings.length > 0} />;
    if (state.isPowerOff) return <PowerOffPanel width={width} reading={last ? formatReading(last.value, last.unit) : ''} />;
    return (
      <Box flexDirection="row" height={layout.bodyRows}>
        {layout.listWidth > 0 ? <StageList state={state} cursor={ui.screen.listCursor} isFocused={focus === 'list'} width={layout.listWidth} height={layout.bodyRows} /> : null}
        <Box flexDirection="column" width={layout.panelWidth} height={layout.bodyRows} overflow="hidden" marginLeft={layout.listWidth > 0 ? 1 : 0}>
          {focus === 'capture' && target ? (
            <>
              <Box flexShrink={0}><Text bold wrap="truncate-end">capture for {target.check}{target.testPoint ? ` at ${target.testPoint}` : ''}</Text></Box>
              <CaptureSlot expect={shape} width={layout.panelWidth} onDone={(c) => { ui.closeCapture(); void run.attachCapture(c, shape); }} onCancel={ui.closeCapture} />
            </>
          ) : (
            <>
              {target ? <CheckPanel plan={plan} target={target} scope={scope} lock={lock} width={layout.panelWidth} /> : <Text>no check selected</Text>}
              {focus === 'rework' ? <ReworkForm {...ui.screen.rework} cursor={ui.reworkField.cursor} parts={knownParts(plan)} width={layout.panelWidth} /> : null}
              {focus === 'end' ? <EndPanel options={endOptions(state)} cursor={ui.screen.endCursor} width={layout.panelWidth} isAllMeasured={openChecks(state).length === 0} /> : null}
              {chart ? <Text>{chart}</Text> : null}
              {!isOverlay && last && lastTarget && verdict && layout.verdictRows > 0 ? <VerdictPanel reading={last} target={lastTarget} result={verdict} explanations={explanation.explanations} hints={explanation.hints} maxLines={layout.verdictRows} width={layout.panelWidth} /> : null}
              <Text wrap="truncate-end" {...toneProps('accent')}>{nextLine}</Text>
              <InputLine check={state.selected} text={ui.reading.value} cursor={ui.reading.cursor} status={status} isFocused={focus === 'input'} placeholder={placeholder} width={layout.panelWidth} />
            </>
          )}
        </Box>
      </Box>
    );
  })();
  return (
    <Box flexDirection="column" width={width}>
      <MemoHeader screen="bring-up" detail={`${serial} · ${plan.plan}`} note={`${done}/${state.targets.length} read${run.runId ? ` · run ${run.runId}` : ''}`} width={width} />
      {body}
      <MemoKeyBar hints={keyHints} width={width} />
    </Box>
  );
}
