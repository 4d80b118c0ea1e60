import { copyFileSync, existsSync, fsyncSync, openSync, closeSync, renameSync, writeSync, unlinkSync } from 'node:fs';
import { dirname, basename, join } from 'node:path';
import { PlanError } from '../plan/errors.js';
import { checkPlanText } from '../plan/load.js';

/**
 * Save a plan's text only if it loads (every problem found is refused with
 * the first one's path and remedy): the previous file is kept as
 * `<file>.bak`, the new text written beside it, flushed to disk and renamed
 * over the old one, so a crash leaves either the old plan or the new one.
 * Used by `plan bom --write` and the plan editor.
 */
export function savePlanText(file: string, text: string, shownAs: string = file): void {
  const problems = checkPlanText(text, shownAs);
  if (problems.length > 0) {
    const first = problems[0] as PlanError;
    throw new PlanError(
      first.file,
      first.path,
      `${first.detail}${problems.length > 1 ? ` (and ${problems.length - 1} more problem${problems.length === 2 ? '' : 's'}: probebook plan check lists them)` : ''}; the plan was not saved`,
    );
  }
  const temp = join(dirname(file), `.${basename(file)}.tmp-${process.pid}`);
  const fd = openSync(temp, 'w', 0o644);
  try {
    writeSync(fd, text);
    fsyncSync(fd);
  } catch (error) {
    closeSync(fd);
    unlinkSync(temp);
    throw error;
  }
  closeSync(fd);
  if (existsSync(file)) copyFileSync(file, `${file}.bak`);
  renameSync(temp, file);
  // The rename is durable once the folder is flushed too.
  const dirFd = openSync(dirname(file), 'r');
  try {
    fsyncSync(dirFd);
  } finally {
    closeSync(dirFd);
  }
}
