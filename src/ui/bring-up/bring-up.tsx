import { Box, Text } from 'ink';
import { memo, useMemo, useRef } from 'react';
import { judge } from '../../run/assess.js';
import { lockReason, openChecks } from '../../run/gates.js';
import { scopeSetup } from '../../run/scope-setup.js';
import { traceChart } from '../charts/trace.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar, type KeyHint } from '../components/key-bar.js';
import type { BringUpProps } from '../screen-props.js';
import { toneProps } from '../theme.js';
import { bringUpHelp, bringUpNotes } from './bring-up-help.js';
import { CaptureSlot, shapeOf } from './capture-slot.js';
import { CheckPanel } from './check-panel.js';
import { expectedTrace, nominalOutputs } from './expected-trace.js';
import { formatReading } from './format-band.js';
import { InputLine } from './input-line.js';
import { bringUpLayout } from './layout.js';
import { ReworkForm } from './rework-form.js';
import { CautionsPanel, EndPanel, PowerOffPanel } from './safety-panels.js';
import { StageList } from './stage-list.js';
import { useBringUpKeys } from './use-bring-up-keys.js';
import { knownParts, useBringUpState } from './use-bring-up-state.js';
import { reworkDefaults } from './rework-defaults.js';
import { VerdictPanel } from './verdict-panel.js';
import { DiagnosisPanel } from './diagnosis-panel.js';
import { useDiagnosis } from './use-diagnosis.js';
import { endOptions } from '../../run/gates.js';
import type { Diagnosis } from '../../analysis/diagnose.js';
import type { Target } from '../../analysis/types.js';
import type { RunState } from '../../run/types.js';

const MemoHeader = memo(Header);
const MemoKeyBar = memo(KeyBar);
const keyHints: readonly KeyHint[] = [['Tab', 'list/input'], ['r', 'rework'], ['a', 'capture'], ['e', 'end run'], ['Esc', 'back'], ['?', 'help']];

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
  const b = useBringUpState(props);
  const { state, target, status } = b;
  // After a fail: every reading of the run diagnosed together (DESIGN §5a); r starts a rework from hypothesis 1.
  const diagnosis = useDiagnosis(plan, targets.targets, state);
  const diagnosisRef = useRef(diagnosis);
  diagnosisRef.current = diagnosis;
  // After a stage fails, the check that best separates the likely faults comes next (Enter takes it),
  // unless the run's own order asks for a safety or rail check first.
  const separating = separatingNext(diagnosis, state, targets.targets);
  const separatingRef = useRef(separating);
  separatingRef.current = separating;
  const keys = useBringUpKeys({ ...b, acceptSuggestion: () => (separatingRef.current ? void b.select(separatingRef.current.check) : b.acceptSuggestion()) }, { isActive, onExit, onDirtyChange: props.onDirtyChange, onTypingChange: props.onTypingChange, reworkDefaults: () => reworkDefaults(plan, b.explanationRef.current.explanations, diagnosisRef.current?.hypotheses[0]) });
  const outputs = useMemo(() => nominalOutputs(plan), [plan]);
  const trace = useMemo(() => (target ? expectedTrace(plan, targets.targets, target, outputs) : null), [plan, targets, target, outputs]);
  const shape = useMemo(() => (trace ? shapeOf(trace.samples) : undefined), [trace]);
  const scope = useMemo(() => (target?.instrument === 'scope' && trace ? scopeSetup(trace.frequency, trace.vpp) : null), [target, trace]);
  const last = state.last;
  const lastTarget = b.lastTarget;
  const result = useMemo(() => (last && lastTarget ? judge(plan, lastTarget, last.value) : null), [plan, last, lastTarget]);
  const lock = useMemo(() => (target ? lockReason(state, target.check) : null), [state, target]);
  const checkRows = 4 + (scope ? 1 : 0) + (lock ? 1 : 0);
  const diagnosisRows = diagnosis && diagnosis.hypotheses.length + diagnosis.unexplained.length > 0 ? Math.min(3, diagnosis.hypotheses.length) + 3 + Math.min(2, b.explanation.hints.length) : 0;
  const explained = diagnosisRows > 0 ? [] : b.explanation.explanations;
  const wanted = result ? 2 + Math.min(3, explained.length) + Math.min(2, b.explanation.hints.length) + (result.warnings.length > 0 ? 1 : 0) + diagnosisRows : 0;
  const labelWidth = Math.max(...state.targets.map((t) => t.check.length - t.stage.length - 1), 8);
  const layout = bringUpLayout(width, height, checkRows, wanted, labelWidth);
  const done = state.targets.length - openChecks(state).length;
  const overlay = keys.focus === 'rework' || keys.focus === 'end' || keys.focus === 'capture';
  const { captured } = b;
  // Drawn again only when the check, the size or a capture changes, not on every keystroke.
  const chart = useMemo(
    () => (trace && layout.traceRows > 0 && !overlay ? traceChart(trace.samples, captured(trace.output, trace.samples), { width: layout.panelWidth, height: layout.traceRows, ...(trace.band ? { band: trace.band } : {}) }) : null),
    [trace, layout.traceRows, layout.panelWidth, overlay, captured],
  );
  const powerReading = last ? formatReading(last.value, last.unit) : '';
  const next = separating ?? state.suggestion;
  const nextLine = state.ended
    ? `run ended: ${state.ended} · Esc back to the bench`
    : next
      ? `next: ${next.check} — ${next.why}${next.check === state.selected ? '' : ' (Enter)'}`
      : 'every check has a reading: e ends the run';
  const body = (() => {
    if (keys.focus === 'help') return <HelpBox title="bring-up" entries={bringUpHelp} notes={bringUpNotes} width={width} />;
    if (status.kind !== 'loading' && state.isCautionsPending && !state.ended) return <CautionsPanel width={width} height={layout.bodyRows} isResumed={state.readings.length > 0} />;
    if (state.isPowerOff) return <PowerOffPanel width={width} reading={powerReading} />;
    return (
      <Box flexDirection="row" height={layout.bodyRows}>
        {layout.listWidth > 0 ? <StageList state={state} cursor={keys.cursor} isFocused={keys.focus === 'list'} width={layout.listWidth} height={layout.bodyRows} /> : null}
        <Box flexDirection="column" width={layout.panelWidth} height={layout.bodyRows} overflow="hidden" marginLeft={layout.listWidth > 0 ? 1 : 0}>
          {keys.focus === 'capture' && target ? (
            <>
              <Text bold wrap="truncate-end">capture for {target.check}{target.testPoint ? ` at ${target.testPoint}` : ''}</Text>
              <CaptureSlot expect={shape} width={layout.panelWidth} onDone={(c) => { keys.closeCapture(); void b.attachCapture(c, shape); }} onCancel={keys.closeCapture} />
            </>
          ) : (
            <>
              {target ? <CheckPanel plan={plan} target={target} scope={scope} lock={lock} width={layout.panelWidth} /> : <Text>no check selected</Text>}
              {keys.focus === 'rework' ? <ReworkForm {...keys.rework} parts={knownParts(plan)} width={layout.panelWidth} /> : null}
              {keys.focus === 'end' ? <EndPanel options={endOptions(state)} cursor={keys.endCursor} width={layout.panelWidth} isAllMeasured={openChecks(state).length === 0} /> : null}
              {chart ? <Text>{chart}</Text> : null}
              {!overlay && last && lastTarget && result && layout.verdictRows > 0 ? <VerdictPanel reading={last} target={lastTarget} result={result} explanations={explained} hints={diagnosisRows > 0 ? [] : b.explanation.hints} maxLines={Math.max(2, layout.verdictRows - diagnosisRows)} width={layout.panelWidth} /> : null}
              {!overlay && diagnosis && diagnosisRows > 0 && layout.verdictRows > 2 ? <DiagnosisPanel diagnosis={diagnosis} hints={b.explanation.hints} maxLines={Math.min(diagnosisRows + 1, layout.verdictRows - 2)} width={layout.panelWidth} /> : null}
              <Text wrap="truncate-end" {...toneProps('accent')}>{nextLine}</Text>
              <InputLine check={state.selected} text={keys.text} status={status} isFocused={keys.focus === 'input'} placeholder={next && next.check !== state.selected ? 'type a reading, or Enter for the next check' : 'type a reading'} width={layout.panelWidth} />
            </>
          )}
        </Box>
      </Box>
    );
  })();
  return (
    <Box flexDirection="column" width={width}>
      <MemoHeader screen="bring-up" detail={`${serial} · ${plan.plan}`} note={`${done}/${state.targets.length} read${b.runId ? ` · run ${b.runId}` : ''}`} width={width} />
      {body}
      <MemoKeyBar hints={keyHints} width={width} />
    </Box>
  );
}
