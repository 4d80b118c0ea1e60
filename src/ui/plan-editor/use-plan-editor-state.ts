import { useMemo, useState } from 'react';
import { stageKinds } from '../../circuit/registry.js';
import { type Draft, addRail, addStage, getAt, inputChoices, moveStage, pathKeys, removeAt, serialiseDraft, setAt, setInput, stagesOf } from '../../plan/draft.js';
import { checkPlanText } from '../../plan/load.js';
import { type Row, editorRows, entryValue, rowForProblem, rowText } from './rows.js';

export type Dialog =
  | { readonly kind: 'help' }
  | { readonly kind: 'catalog'; readonly selected: number; readonly isHelpOpen: boolean }
  | { readonly kind: 'leave'; readonly isHelpOpen: boolean }
  | { readonly kind: 'remove'; readonly list: 'stages' | 'rails'; readonly index: number; readonly label: string; readonly isHelpOpen: boolean };

export interface Notice {
  readonly tone: 'good' | 'bad';
  readonly text: string;
}

export interface PlanEditorStateOptions {
  /** The file as the user named it (messages). */
  readonly file: string;
  readonly initial: Draft;
  /** The text on disk, or null for a new file (then any draft is unsaved). */
  readonly savedText: string | null;
  /** Write a plan that loads (`savePlanText`); throws with the reason. */
  readonly save: (text: string) => void;
  readonly onExit: () => void;
}

/** The plan editor's state: the draft, the selected row, the field being typed, the dialog and the last notice. */
export function usePlanEditorState({ file, initial, savedText, save, onExit }: PlanEditorStateOptions) {
  const [draft, setDraft] = useState<Draft>(initial);
  const [saved, setSaved] = useState<string | null>(savedText);
  const [selected, setSelected] = useState(0);
  const [editing, setEditing] = useState<{ readonly key: string; readonly text: string } | null>(null);
  const [dialog, setDialog] = useState<Dialog | null>(null);
  const [notice, setNotice] = useState<Notice | null>(null);
  const kinds = Object.keys(stageKinds);

  const rows = useMemo(() => editorRows(draft), [draft]);
  const text = useMemo(() => serialiseDraft(draft), [draft]);
  const row = rows[Math.min(selected, rows.length - 1)] as Row;
  const isDirty = text !== saved;

  // While a field is being typed, the targets follow what it would store.
  const preview = useMemo(() => {
    if (!editing) return text;
    const r = rows.find((x) => x.key === editing.key);
    if (!r) return text;
    const entry = entryValue(r, editing.text, getAt(draft, r.path));
    return 'error' in entry ? text : serialiseDraft(setAt(draft, r.path, entry.value));
  }, [editing, rows, draft, text]);

  /** Apply a change and keep the selection on the row with `key` (or the same place). */
  const change = (next: Draft, key: string = row.key) => {
    setDraft(next);
    const at = editorRows(next).findIndex((r) => r.key === key);
    if (at >= 0) setSelected(at);
    setNotice(null);
  };
  const selectStage = (next: Draft, index: number) => {
    const at = editorRows(next).findIndex((r) => r.stageIndex === index);
    setDraft(next);
    if (at >= 0) setSelected(at);
  };

  const cycleInput = (delta: number) => {
    if (row.kind !== 'input' || row.stageIndex === undefined) return;
    const choices = [...inputChoices(draft, row.stageIndex), ''];
    const now = String(getAt(draft, row.path) ?? '');
    const at = choices.indexOf(now);
    const next = choices[(at + delta + choices.length) % choices.length] ?? '';
    change(setInput(draft, row.stageIndex, next === '' ? undefined : next));
  };

  return {
    file,
    draft,
    rows,
    row,
    selected: Math.min(selected, rows.length - 1),
    text,
    preview,
    isDirty,
    editing,
    dialog,
    notice,
    kinds,
    move: (delta: number) => setSelected((s) => Math.max(0, Math.min(rows.length - 1, s + delta))),
    moveTo: (index: number) => setSelected(Math.max(0, Math.min(rows.length - 1, index))),
    /** Enter on a row: type into it, choose its input, or do its action. */
    activate: () => {
      if (row.action === 'add-stage') setDialog({ kind: 'catalog', selected: 0, isHelpOpen: false });
      else if (row.action === 'add-rail') change(addRail(draft), JSON.stringify(['rails', (draft['rails'] as unknown[] | undefined)?.length ?? 0, 'id']));
      else if (row.kind === 'input') cycleInput(1);
      else setEditing({ key: row.key, text: rowText(draft, row) });
    },
    cycleInput,
    typed: (value: string) => setEditing((e) => (e ? { ...e, text: value } : e)),
    commit: (value: string) => {
      const r = rows.find((x) => x.key === editing?.key);
      if (!r) return setEditing(null);
      const entry = entryValue(r, value, getAt(draft, r.path));
      if ('error' in entry) return setNotice({ tone: 'bad', text: `${r.label.trim()}: ${entry.error}` });
      setEditing(null);
      // A stage renamed: its rows change keys, so follow the stage rather than the key.
      if (r.stageIndex !== undefined && r.path[r.path.length - 1] === 'id' && r.path.length === 3) selectStage(setAt(draft, r.path, entry.value), r.stageIndex);
      else change(setAt(draft, r.path, entry.value), r.key);
    },
    cancelEdit: () => setEditing(null),
    openCatalog: () => setDialog({ kind: 'catalog', selected: 0, isHelpOpen: false }),
    catalogMove: (delta: number) => setDialog((d) => (d?.kind === 'catalog' ? { ...d, selected: Math.max(0, Math.min(kinds.length - 1, d.selected + delta)) } : d)),
    catalogPick: () => {
      if (dialog?.kind !== 'catalog') return;
      const next = addStage(draft, kinds[dialog.selected] as string);
      setDialog(null);
      selectStage(next, stagesOf(next).length - 1);
      setNotice({ tone: 'good', text: `added a ${kinds[dialog.selected]} stage with example values: type your board's values over them` });
    },
    addRail: () => change(addRail(draft), JSON.stringify(['rails', (draft['rails'] as unknown[] | undefined)?.length ?? 0, 'id'])),
    askRemove: () => {
      if (row.stageIndex !== undefined) setDialog({ kind: 'remove', list: 'stages', index: row.stageIndex, label: `stage ${String(stagesOf(draft)[row.stageIndex]?.['id'])}`, isHelpOpen: false });
      else if (row.railIndex !== undefined) setDialog({ kind: 'remove', list: 'rails', index: row.railIndex, label: `rail ${String(getAt(draft, ['rails', row.railIndex, 'id']))}`, isHelpOpen: false });
      else setNotice({ tone: 'bad', text: 'd removes a stage or a rail: select one of its rows first' });
    },
    confirmRemove: () => {
      if (dialog?.kind !== 'remove') return;
      setDialog(null);
      change(removeAt(draft, dialog.list, dialog.index));
      setNotice({ tone: 'good', text: `removed ${dialog.label}` });
    },
    moveStage: (delta: -1 | 1) => {
      if (row.stageIndex === undefined) return setNotice({ tone: 'bad', text: '[ and ] move a stage: select one of its rows first' });
      const next = moveStage(draft, row.stageIndex, delta);
      if (next !== draft) selectStage(next, row.stageIndex + delta);
    },
    save: () => {
      const problems = checkPlanText(text, file);
      const first = problems[0];
      if (first) {
        setSelected(rowForProblem(rows, pathKeys(first.path)));
        return setNotice({ tone: 'bad', text: `not saved: ${first.path || file}: ${first.detail}${problems.length > 1 ? ` (${problems.length - 1} more)` : ''}` });
      }
      try {
        save(text);
        setSaved(text);
        setNotice({ tone: 'good', text: `saved ${file}${saved !== null ? ` (the previous file kept as ${file}.bak)` : ''}` });
      } catch (error) {
        setNotice({ tone: 'bad', text: `not saved: ${error instanceof Error ? error.message : String(error)}` });
      }
    },
    requestLeave: () => (text !== saved ? setDialog({ kind: 'leave', isHelpOpen: false }) : onExit()),
    leave: onExit,
    toggleHelp: () => setDialog((d) => (d === null ? { kind: 'help' } : d.kind === 'help' ? null : { ...d, isHelpOpen: !('isHelpOpen' in d && d.isHelpOpen) })),
    closeDialog: () => setDialog(null),
  };
}

export type PlanEditorState = ReturnType<typeof usePlanEditorState>;
