import { Box, Text } from 'ink';
import { memo, useMemo, useRef } from 'react';
import type { Diagnosis } from '../../analysis/diagnose.js';
import type { Target } from '../../analysis/types.js';
import { endOptions, lockReason, openChecks } from '../../run/gates.js';
import type { RunState } from '../../run/types.js';
import { traceChart } from '../charts/trace.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar, type KeyHint } from '../components/key-bar.js';
import type { BringUpProps } from '../screen-props.js';
import { toneProps } from '../theme.js';
import { bringUpHelpFor } from './bring-up-help.js';
import { CaptureSlot } from './capture-slot.js';
import { CheckPanel } from './check-panel.js';
import { DiagnosisPanel } from './diagnosis-panel.js';
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
import { useDiagnosis } from './use-diagnosis.js';
import { VerdictPanel } from './verdict-panel.js';

const MemoHeader = memo(Header);
const MemoKeyBar = memo(KeyBar);
const keyHints: readonly KeyHint[] = [
  ['Tab', 'list/input'],
  ['r', 'rework'],
  ['a', 'capture'],
  ['e', 'end run'],
  ['Esc', 'back'],
  ['?', 'help'],
];

/** The diagnosis's most informative next check, when the last stage reading failed and the run's order allows it. */
function separatingNext(diagnosis: Diagnosis | null, state: RunState, targets: readonly Target[]): { check: string; why: string } | null {
  const next = diagnosis?.next;
  const phase = (check: string | undefined) => targets.find((t) => t.check === check)?.phase;
  if (!next || state.ended || phase(state.last?.check) !== 'stage' || phase(state.suggestion?.check) !== 'stage') return null;
  return lockReason(state, next.check) === null ? next : null;
}

/** The bring-up screen: walks one board through every check in a safe order. */
export function BringUpScreen(props: BringUpProps) {
  const { plan, targets, serial, width, height, isActive = true, onExit } = props;
  const run = useBringUpState(props);
  const { state, target, status, lastTarget, explanation } = run;
  // After a fail: every reading of the run diagnosed together (DESIGN §5a); r starts a rework from hypothesis 1.
  const diagnosis = useDiagnosis(plan, targets.targets, state);
  const diagnosisRef = useRef(diagnosis);
  diagnosisRef.current = diagnosis;
  // After a stage fails, the check that best separates the likely faults comes next (Enter takes it),
  // unless the run's own order asks for a safety or rail check first.
  const separating = separatingNext(diagnosis, state, targets.targets);
  const separatingRef = useRef(separating);
  separatingRef.current = separating;
  const runView = { ...run, acceptSuggestion: () => (separatingRef.current ? void run.select(separatingRef.current.check) : run.acceptSuggestion()) };
  const ui = useBringUpScreenState(runView, {
    onExit,
    onDirtyChange: props.onDirtyChange,
    onTypingChange: props.onTypingChange,
    reworkDefaults: () => reworkDefaults(plan, run.explanationRef.current.explanations, diagnosisRef.current?.hypotheses[0]),
  });
  useBringUpKeys(run, ui, isActive);
  const { focus } = ui.screen;
  const { trace, shape, scope, verdict, lock } = useCheckFigures(plan, targets, state, target, lastTarget);
  const last = state.last;
  const checkRows = 4 + (scope ? 1 : 0) + (lock ? 1 : 0);
  const diagnosisRows =
    diagnosis && diagnosis.hypotheses.length + diagnosis.unexplained.length > 0
      ? Math.min(3, diagnosis.hypotheses.length) + 3 + Math.min(2, explanation.hints.length)
      : 0;
  const explained = diagnosisRows > 0 ? [] : explanation.explanations;
  const verdictRows = verdict
    ? 2 + Math.min(3, explained.length) + Math.min(2, explanation.hints.length) + (verdict.warnings.length > 0 ? 1 : 0) + diagnosisRows
    : 0;
  const labelWidth = Math.max(...state.targets.map((t) => t.check.length - t.stage.length - 1), 8);
  const layout = bringUpLayout(width, height, checkRows, verdictRows, labelWidth);
  const done = state.targets.length - openChecks(state).length;
  const isOverlay = focus === 'rework' || focus === 'end' || focus === 'capture';
  const { captured } = run;
  // Drawn again only when the check, the size or a capture changes, not on every keystroke.
  const chart = useMemo(
    () =>
      trace && layout.traceRows > 0 && !isOverlay
        ? traceChart(trace.samples, captured(trace.output, trace.samples), {
            width: layout.panelWidth,
            height: layout.traceRows,
            ...(trace.band ? { band: trace.band } : {}),
          })
        : null,
    [trace, layout.traceRows, layout.panelWidth, isOverlay, captured],
  );
  const next = separating ?? state.suggestion;
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
    if (status.kind !== 'loading' && state.isCautionsPending && !state.ended)
      return <CautionsPanel width={width} height={layout.bodyRows} isResumed={state.readings.length > 0} />;
    if (state.isPowerOff) return <PowerOffPanel width={width} reading={last ? formatReading(last.value, last.unit) : ''} />;
    return (
      <Box flexDirection="row" height={layout.bodyRows}>
        {layout.listWidth > 0 ? (
          <StageList state={state} cursor={ui.screen.listCursor} isFocused={focus === 'list'} width={layout.listWidth} height={layout.bodyRows} />
        ) : null}
        <Box flexDirection="column" width={layout.panelWidth} height={layout.bodyRows} overflow="hidden" marginLeft={layout.listWidth > 0 ? 1 : 0}>
          {focus === 'capture' && target ? (
            <>
              <Box flexShrink={0}>
                <Text bold wrap="truncate-end">
                  capture for {target.check}
                  {target.testPoint ? ` at ${target.testPoint}` : ''}
                </Text>
              </Box>
              <CaptureSlot
                expect={shape}
                width={layout.panelWidth}
                onDone={(c) => {
                  ui.closeCapture();
                  void run.attachCapture(c, shape);
                }}
                onCancel={ui.closeCapture}
              />
            </>
          ) : (
            <>
              {target ? <CheckPanel plan={plan} target={target} scope={scope} lock={lock} width={layout.panelWidth} /> : <Text>no check selected</Text>}
              {focus === 'rework' ? (
                <ReworkForm {...ui.screen.rework} cursor={ui.reworkField.cursor} parts={knownParts(plan)} width={layout.panelWidth} />
              ) : null}
              {focus === 'end' ? (
                <EndPanel options={endOptions(state)} cursor={ui.screen.endCursor} width={layout.panelWidth} isAllMeasured={openChecks(state).length === 0} />
              ) : null}
              {chart ? <Text>{chart}</Text> : null}
              {!isOverlay && last && lastTarget && verdict && layout.verdictRows > 0 ? (
                <VerdictPanel
                  reading={last}
                  target={lastTarget}
                  result={verdict}
                  explanations={explained}
                  hints={diagnosisRows > 0 ? [] : explanation.hints}
                  maxLines={Math.max(2, layout.verdictRows - diagnosisRows)}
                  width={layout.panelWidth}
                />
              ) : null}
              {!isOverlay && diagnosis && diagnosisRows > 0 && layout.verdictRows > 2 ? (
                <DiagnosisPanel
                  diagnosis={diagnosis}
                  hints={explanation.hints}
                  maxLines={Math.min(diagnosisRows + 1, layout.verdictRows - 2)}
                  width={layout.panelWidth}
                />
              ) : null}
              <Text wrap="truncate-end" {...toneProps('accent')}>
                {nextLine}
              </Text>
              <InputLine
                check={state.selected}
                text={ui.reading.value}
                cursor={ui.reading.cursor}
                status={status}
                isFocused={focus === 'input'}
                placeholder={placeholder}
                width={layout.panelWidth}
              />
            </>
          )}
        </Box>
      </Box>
    );
  })();
  return (
    <Box flexDirection="column" width={width}>
      <MemoHeader
        screen="bring-up"
        detail={`${serial} · ${plan.plan}`}
        note={`${done}/${state.targets.length} read${run.runId ? ` · run ${run.runId}` : ''}`}
        width={width}
      />
      {body}
      <MemoKeyBar hints={keyHints} width={width} />
    </Box>
  );
}
