import { useRef } from 'react';
import { Box, Text } from 'ink';
import { defaultSeed, defaultTrials } from '../../analysis/targets.js';
import { type Draft, pathKeys, stagesOf } from '../../plan/draft.js';
import { Header } from '../components/header.js';
import { HelpBox } from '../components/help-box.js';
import { KeyBar } from '../components/key-bar.js';
import { scrollWindow } from '../components/scroll-window.js';
import { toneProps } from '../theme.js';
import { AskBox } from './ask-box.js';
import { editorHelp, editorKeys, editorNotes } from './editor-help.js';
import { FieldEditor } from './field-line.js';
import { FormList } from './form-list.js';
import { rowForProblem } from './rows.js';
import { StageCatalog } from './stage-catalog.js';
import { TargetsPanel } from './targets-panel.js';
import { useLiveTargets } from './use-live-targets.js';
import { usePlanEditorKeys } from './use-plan-editor-keys.js';
import { usePlanEditorState } from './use-plan-editor-state.js';

export interface PlanEditorProps {
  /** The plan file as the user named it. */
  readonly file: string;
  readonly initial: Draft;
  /** The text on disk; null for a new file. */
  readonly savedText: string | null;
  readonly save: (text: string) => void;
  readonly onExit: () => void;
  readonly width: number;
  readonly height: number;
  /** Monte Carlo trials of the statistical band. @default defaultTrials */
  readonly trials?: number;
  /** @default true */
  readonly isActive?: boolean;
}

/** The plan editor (DESIGN §7b): the form, the field being typed, the live targets and warnings, the dialogs. */
export function PlanEditor({ file, initial, savedText, save, onExit, width, height, trials = defaultTrials, isActive = true }: PlanEditorProps) {
  const state = usePlanEditorState({ file, initial, savedText, save, onExit });
  const live = useLiveTargets(state.preview, file, { trials, seed: defaultSeed });
  const isWide = width >= 120;
  const formWidth = isWide ? Math.min(56, Math.floor(width * 0.45)) : width;
  const panelWidth = isWide ? width - formWidth - 2 : width;
  const detailRows = 3;
  const panelRows = isWide ? height - 2 : Math.max(4, Math.floor((height - 2 - detailRows) / 2.6));
  const formRows = Math.max(3, height - 2 - detailRows - (isWide ? 0 : panelRows));
  usePlanEditorKeys(state, formRows, isActive);
  const start = useRef(0);
  const view = scrollWindow(state.rows.length, state.selected, formRows, start.current);
  start.current = view.start;
  const problems = new Map<number, string>();
  for (const p of live.problems)
    if (!problems.has(rowForProblem(state.rows, pathKeys(p.path)))) problems.set(rowForProblem(state.rows, pathKeys(p.path)), p.detail);
  const row = state.row;
  const stage =
    row.stageIndex !== undefined ? String(stagesOf(state.draft)[row.stageIndex]?.['id'] ?? '') : row.section.startsWith('rail') ? 'rails' : undefined;
  const d = state.dialog;

  if (d?.kind === 'help') return <HelpBox title="plan editor" entries={editorHelp} notes={editorNotes} width={width} />;
  const problem = problems.get(state.selected);
  const form = (
    <Box flexDirection="column" width={formWidth}>
      <FormList draft={state.draft} rows={state.rows} start={view.start} count={formRows} selected={state.selected} problems={problems} width={formWidth} />
      {state.editing ? (
        <FieldEditor
          key={state.editing.key}
          row={state.rows.find((r) => r.key === state.editing?.key) ?? row}
          initial={state.editing.text}
          onChange={state.typed}
          onSubmit={state.commit}
          onCancel={state.cancelEdit}
        />
      ) : (
        <Text wrap="truncate-end" {...toneProps(problem ? 'bad' : state.notice ? (state.notice.tone === 'good' ? 'good' : 'bad') : 'dim')}>
          {problem
            ? `✗ ${problem}`
            : state.notice
              ? `${state.notice.tone === 'good' ? '✓' : '✗'} ${state.notice.text}`
              : `${state.isDirty ? 'unsaved changes' : 'saved'} · ${state.rows.length} rows`}
        </Text>
      )}
      {state.editing ? null : (
        <Text wrap="truncate-end">{state.notice && problem ? `${state.notice.tone === 'good' ? '✓' : '✗'} ${state.notice.text}` : ' '}</Text>
      )}
      <Text wrap="truncate-end" {...toneProps('dim')}>
        {row.label.replace(/^▸ /, '').trim()} — {row.help}
      </Text>
    </Box>
  );
  return (
    <Box flexDirection="column" width={width} height={height}>
      <Header screen="plan editor" detail={file} note={state.isDirty ? '● unsaved' : 'saved'} width={width} />
      {d?.kind === 'catalog' ? <StageCatalog selected={d.selected} width={width} height={height - 2} isHelpOpen={d.isHelpOpen} /> : null}
      {d?.kind === 'leave' ? (
        <AskBox
          title="Leave the plan editor?"
          detail={`${file} has unsaved changes; they are lost if you leave now.`}
          yes="leave without saving"
          isHelpOpen={d.isHelpOpen}
        />
      ) : null}
      {d?.kind === 'remove' ? (
        <AskBox
          title={`Remove ${d.label}?`}
          detail="Its values, test points and refs go with it (nothing is written until you save)."
          yes="remove it"
          isHelpOpen={d.isHelpOpen}
        />
      ) : null}
      {d === null ? (
        <Box flexDirection={isWide ? 'row' : 'column'}>
          {form}
          {isWide ? <Box width={2} /> : null}
          <TargetsPanel live={live} stage={stage} rows={panelRows} width={panelWidth} />
        </Box>
      ) : null}
      <Box flexGrow={1} />
      <KeyBar hints={editorKeys} width={width} />
    </Box>
  );
}
