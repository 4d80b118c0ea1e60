import type { Command } from './command.js';
import { UsageError } from './errors.js';

/** `probebook plan new FILE`: the plan editor screen (src/ui/plan-editor). */
export const planNewCommand: Command = async (argv) => {
  throw new UsageError(`the plan editor is not built yet (${argv.join(' ')}); write the plan as JSON and check it with probebook plan check PLAN`);
};
