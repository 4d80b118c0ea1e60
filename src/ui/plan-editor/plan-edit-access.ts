import type { Draft } from '../../plan/draft.js';
import type { Plan } from '../../plan/types.js';

/** A plan opened for editing: the file its edit is saved to and what the editor starts from. */
export interface PlanEditTarget {
  /** The file as the technician knows it (the `--plan` path as given, or the new file for a plan the log alone keeps). */
  readonly file: string;
  readonly draft: Draft;
  /** The text on disk; null when the file is new (then the editor starts with unsaved changes). */
  readonly savedText: string | null;
  /** Write a plan that loads; throws with the reason. */
  readonly save: (text: string) => void;
  /** The saved file, loaded again. */
  readonly reload: () => Promise<Plan>;
}

/**
 * How a screen opens a plan in the plan editor. The CLI edge gives it (it owns
 * the files and the save path, `src/cli/plan-save.ts`); the UI writes no file itself.
 */
export interface PlanEditAccess {
  /** `origin`: a `--plan` file, or a snapshot the log keeps (never changed: saved as a new file). */
  open(plan: Plan, origin: 'file' | 'log'): Promise<PlanEditTarget>;
}
