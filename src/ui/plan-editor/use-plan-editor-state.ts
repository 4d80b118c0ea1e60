import { useMemo, useRef, useState } from 'react';
import { stageKinds } from '../../circuit/registry.js';
import {
  type Draft,
  addRail,
  addStage,
  getAt,
  inputChoices,
  moveStage,
  pathKeys,
  removeAt,
  serialiseDraft,
  setAt,
  setInput,
  stagesOf,
} from '../../plan/draft.js';
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
  const [draft, setDraftState] = useState<Draft>(initial);
  // What is on disk, as this editor would write it: opening a file is not a change, whatever its layout.
  const [saved, setSaved] = useState<string | null>(() => (savedText === null ? null : serialiseDraft(initial)));
  const [selected, setSelectedState] = useState(0);
  const [editing, setEditingState] = useState<{ readonly key: string; readonly text: string } | null>(null);
  const [dialog, setDialogState] = useState<Dialog | null>(null);
  const [notice, setNotice] = useState<Notice | null>(null);
  // Keys can arrive faster than frames ("↓↓↓ Enter" in one chunk, a paste): every
  // action reads the latest draft, selection and dialog from here, not from the
  // render its handler was made in.
  const now = useRef({ draft: initial, selected: 0, dialog: null as Dialog | null, editing: null as { key: string; text: string } | null });
  const setDraft = (next: Draft) => {
    now.current.draft = next;
    setDraftState(next);
  };
  const setSelected = (next: number) => {
    now.current.selected = next;
    setSelectedState(next);
  };
  const setDialog = (next: Dialog | null) => {
    now.current.dialog = next;
    setDialogState(next);
  };
  const setEditing = (next: { key: string; text: string } | null) => {
    now.current.editing = next;
    setEditingState(next);
  };
  const kinds = Object.keys(stageKinds);

  const rows = useMemo(() => editorRows(draft), [draft]);
  const text = useMemo(() => serialiseDraft(draft), [draft]);
  const isDirty = text !== saved;
  /** The rows and the selected row as they are now. */
  const current = () => {
    const all = editorRows(now.current.draft);
    const at = Math.min(now.current.selected, all.length - 1);
    return { all, at, row: all[at] as Row, draft: now.current.draft };
  };

  // While a field is being typed, the targets follow what it would store.
  const preview = useMemo(() => {
    if (!editing) return text;
    const r = rows.find((x) => x.key === editing.key);
    if (!r) return text;
    const entry = entryValue(r, editing.text, getAt(draft, r.path));
    return 'error' in entry ? text : serialiseDraft(setAt(draft, r.path, entry.value));
  }, [editing, rows, draft, text]);

  /** Apply a change and keep the selection on the row with `key` (or where it was). */
  const change = (next: Draft, key: string = current().row.key) => {
    setDraft(next);
    const at = editorRows(next).findIndex((r) => r.key === key);
    setSelected(at >= 0 ? at : Math.min(now.current.selected, editorRows(next).length - 1));
    setNotice(null);
  };
  const selectStage = (next: Draft, index: number) => {
    const at = editorRows(next).findIndex((r) => r.stageIndex === index);
    setDraft(next);
    if (at >= 0) setSelected(at);
  };
  const railKey = (d: Draft) => JSON.stringify(['rails', (d['rails'] as unknown[] | undefined)?.length ?? 0, 'id']);

  const cycleInput = (delta: number) => {
    const { row, draft: d } = current();
    if (row.kind !== 'input' || row.stageIndex === undefined) return;
    const choices = [...inputChoices(d, row.stageIndex), ''];
    const at = choices.indexOf(String(getAt(d, row.path) ?? ''));
    const next = choices[(at + delta + choices.length) % choices.length] ?? '';
    change(setInput(d, row.stageIndex, next === '' ? undefined : next));
  };

  return {
    file,
    draft,
    rows,
    row: rows[Math.min(selected, rows.length - 1)] as Row,
    selected: Math.min(selected, rows.length - 1),
    text,
    preview,
    isDirty,
    editing,
    dialog,
    notice,
    kinds,
    /** The dialog and the field being typed as they are now (for keys that arrive before the next frame). */
    dialogNow: () => now.current.dialog,
    isEditingNow: () => now.current.editing !== null,
    move: (delta: number) => setSelected(Math.max(0, Math.min(current().all.length - 1, now.current.selected + delta))),
    moveTo: (index: number) => setSelected(Math.max(0, Math.min(current().all.length - 1, index))),
    /** Enter on a row: type into it, choose its input, or do its action. */
    activate: () => {
      const { row, draft: d } = current();
      if (row.action === 'add-stage') setDialog({ kind: 'catalog', selected: 0, isHelpOpen: false });
      else if (row.action === 'add-rail') change(addRail(d), railKey(d));
      else if (row.kind === 'input') cycleInput(1);
      else setEditing({ key: row.key, text: rowText(d, row) });
    },
    cycleInput,
    typed: (value: string) => now.current.editing && setEditing({ ...now.current.editing, text: value }),
    commit: (value: string) => {
      const d = now.current.draft;
      const r = editorRows(d).find((x) => x.key === now.current.editing?.key);
      if (!r) return setEditing(null);
      const entry = entryValue(r, value, getAt(d, r.path));
      if ('error' in entry) return setNotice({ tone: 'bad', text: `${r.label.trim()}: ${entry.error}` });
      setEditing(null);
      change(setAt(d, r.path, entry.value), r.key);
    },
    cancelEdit: () => setEditing(null),
    openCatalog: () => setDialog({ kind: 'catalog', selected: 0, isHelpOpen: false }),
    catalogMove: (delta: number) => {
      const d = now.current.dialog;
      if (d?.kind === 'catalog') setDialog({ ...d, selected: Math.max(0, Math.min(kinds.length - 1, d.selected + delta)) });
    },
    catalogPick: () => {
      const dlg = now.current.dialog;
      if (dlg?.kind !== 'catalog') return;
      const kind = kinds[dlg.selected] as string;
      const next = addStage(now.current.draft, kind);
      setDialog(null);
      selectStage(next, stagesOf(next).length - 1);
      setNotice({ tone: 'good', text: `added a ${kind} stage with example values: type your board's values over them` });
    },
    addRail: () => change(addRail(now.current.draft), railKey(now.current.draft)),
    askRemove: () => {
      const { row, draft: d } = current();
      if (row.stageIndex !== undefined)
        setDialog({ kind: 'remove', list: 'stages', index: row.stageIndex, label: `stage ${String(stagesOf(d)[row.stageIndex]?.['id'])}`, isHelpOpen: false });
      else if (row.railIndex !== undefined)
        setDialog({
          kind: 'remove',
          list: 'rails',
          index: row.railIndex,
          label: `rail ${String(getAt(d, ['rails', row.railIndex, 'id']))}`,
          isHelpOpen: false,
        });
      else setNotice({ tone: 'bad', text: 'd removes a stage or a rail: select one of its rows first' });
    },
    confirmRemove: () => {
      const dlg = now.current.dialog;
      if (dlg?.kind !== 'remove') return;
      setDialog(null);
      change(removeAt(now.current.draft, dlg.list, dlg.index));
      setNotice({ tone: 'good', text: `removed ${dlg.label}` });
    },
    moveStage: (delta: -1 | 1) => {
      const { row, draft: d } = current();
      if (row.stageIndex === undefined) return setNotice({ tone: 'bad', text: '[ and ] move a stage: select one of its rows first' });
      const next = moveStage(d, row.stageIndex, delta);
      if (next !== d) selectStage(next, row.stageIndex + delta);
    },
    save: () => {
      const { all, draft: d } = current();
      const out = serialiseDraft(d);
      const problems = checkPlanText(out, file);
      const first = problems[0];
      if (first) {
        setSelected(rowForProblem(all, pathKeys(first.path)));
        return setNotice({
          tone: 'bad',
          text: `not saved: ${first.path || file}: ${first.detail}${problems.length > 1 ? ` (${problems.length - 1} more)` : ''}`,
        });
      }
      try {
        save(out);
        setSaved(out);
        setNotice({ tone: 'good', text: `saved ${file}${saved !== null ? ` (the previous file kept as ${file}.bak)` : ''}` });
      } catch (error) {
        setNotice({ tone: 'bad', text: `not saved: ${error instanceof Error ? error.message : String(error)}` });
      }
    },
    requestLeave: () => (serialiseDraft(now.current.draft) !== saved ? setDialog({ kind: 'leave', isHelpOpen: false }) : onExit()),
    leave: onExit,
    toggleHelp: () => {
      const d = now.current.dialog;
      setDialog(d === null ? { kind: 'help' } : d.kind === 'help' ? null : { ...d, isHelpOpen: !d.isHelpOpen });
    },
    closeDialog: () => setDialog(null),
  };
}

export type PlanEditorState = ReturnType<typeof usePlanEditorState>;
