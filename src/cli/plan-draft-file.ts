import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { basename, join, resolve } from 'node:path';
import { type Draft, newDraft, parseDraft } from '../plan/draft.js';
import { findJsonFault } from '../plan/json-position.js';
import { loadPlanFile } from '../plan/load.js';
import type { PlanEditAccess } from '../ui/plan-editor/plan-edit-access.js';
import { UsageError } from './errors.js';
import { savePlanText } from './plan-save.js';

/** A plan id from the file's name: `bench-7.plan.json` → `bench-7`. */
export function idFromFile(file: string): string {
  const id = basename(file)
    .replace(/\.plan\.json$|\.json$/i, '')
    .replace(/[^A-Za-z0-9._-]/g, '-')
    .replace(/^[^A-Za-z0-9]+/, '');
  return id || 'new-board';
}

/** The draft to open: the file's plan, or a new plan's defaults when there is no file yet. */
export async function openDraft(path: string, shownAs: string): Promise<{ draft: Draft; savedText: string | null }> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return { draft: newDraft(idFromFile(shownAs)), savedText: null };
    throw new UsageError(`plan ${shownAs}: ${code === 'EISDIR' ? 'is a folder; give the path of a *.plan.json file' : `cannot be read (${code})`}`);
  }
  try {
    return { draft: parseDraft(text), savedText: text };
  } catch {
    const fault = findJsonFault(text);
    throw new UsageError(
      `plan ${shownAs}${fault ? `, line ${fault.line}, column ${fault.column}` : ''}: not a JSON object${fault ? ` (expected ${fault.expected})` : ''}; mend it in a text editor first (probebook plan check ${shownAs} lists every problem)`,
    );
  }
}

/** `<id>.plan.json` in `cwd`, or `<id>-2.plan.json`, `-3`, … when that name is taken. */
export function freePlanFile(cwd: string, planId: string): string {
  const id = idFromFile(planId);
  for (let n = 1; ; n++) {
    const name = `${id}${n === 1 ? '' : `-${n}`}.plan.json`;
    if (!existsSync(join(cwd, name))) return name;
  }
}

/**
 * How the bench screen's plan screen edits a plan (the `e` key), on the files of
 * the folder probebook was started in. A `--plan` file is opened as it is on
 * disk now and saved in place through `savePlanText` (only a plan that loads;
 * the old file kept as FILE.bak); if it has gone since, the plan as loaded is
 * the draft. A plan the log alone keeps (a snapshot some run used) is never
 * changed: its edit is saved as a new file here.
 */
export function planEditAccess(cwd: string): PlanEditAccess {
  const target = (file: string, draft: Draft, savedText: string | null) => {
    const path = resolve(cwd, file);
    return {
      file,
      draft,
      savedText,
      save: (text: string) => savePlanText(path, text, file),
      reload: () => loadPlanFile(file, { cwd }),
    };
  };
  return {
    async open(plan, origin) {
      if (origin === 'file') {
        const { draft, savedText } = await openDraft(resolve(cwd, plan.file), plan.file);
        return savedText === null ? target(plan.file, parseDraft(plan.text), null) : target(plan.file, draft, savedText);
      }
      return target(freePlanFile(cwd, plan.plan), parseDraft(plan.text), null);
    },
  };
}
