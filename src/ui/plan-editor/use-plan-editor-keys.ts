import { type Key, useInput } from 'ink';
import { splitKeys } from '../components/key-chunks.js';
import type { PlanEditorState } from './use-plan-editor-state.js';

/**
 * Keys of the plan editor. While a field is being typed the text field has
 * the keyboard (Enter keeps, Esc drops); otherwise these move, edit, add,
 * remove and save. Every dialog answers `?` and Esc.
 */
export function usePlanEditorKeys(state: PlanEditorState, pageSize: number, isActive: boolean) {
  const onDialog = (input: string, key: Key) => {
    const d = state.dialogNow();
    if (!d) return;
    if (input === '?') return state.toggleHelp();
    if (d.kind === 'help') {
      if (key.escape || key.return) state.closeDialog();
    } else if (d.kind === 'catalog') {
      if (key.upArrow || input === 'k') state.catalogMove(-1);
      else if (key.downArrow || input === 'j') state.catalogMove(1);
      else if (key.return) state.catalogPick();
      else if (key.escape) state.closeDialog();
    } else if (input === 'y' || input === 'Y') {
      if (d.kind === 'leave') state.leave();
      else state.confirmRemove();
    } else if (input === 'n' || input === 'N' || key.escape || key.return) state.closeDialog();
  };
  const onForm = (input: string, key: Key) => {
    if ((key.ctrl && input === 's') || input === 's') state.save();
    else if (key.upArrow || input === 'k') state.move(-1);
    else if (key.downArrow || input === 'j') state.move(1);
    else if (key.pageUp) state.move(-pageSize);
    else if (key.pageDown) state.move(pageSize);
    else if (key.home || input === 'g') state.moveTo(0);
    else if (key.end || input === 'G') state.moveTo(state.rows.length - 1);
    else if (key.leftArrow) state.cycleInput(-1);
    else if (key.rightArrow) state.cycleInput(1);
    else if (key.return || input === 'e') state.activate();
    else if (input === 'a') state.openCatalog();
    else if (input === 'r') state.addRail();
    else if (input === 'd' || key.delete) state.askRemove();
    else if (input === '[') state.moveStage(-1);
    else if (input === ']') state.moveStage(1);
    else if (input === '?') state.toggleHelp();
    else if (key.escape || input === 'q') state.requestLeave();
  };
  useInput(
    (chunk, key) => {
      // Keys typed faster than a frame arrive as one chunk ("kkk"): one at a time.
      for (const input of splitKeys(chunk, key)) {
        if (state.isEditingNow()) return;
        if (state.dialogNow()) onDialog(input, key);
        else onForm(input, key);
      }
    },
    { isActive: isActive && state.editing === null },
  );
}
