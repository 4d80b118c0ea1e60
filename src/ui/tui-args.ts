import { UsageError } from '../cli/errors.js';

export const tuiUsage = 'probebook [--log DIR] [--plan FILE]... [--operator NAME]';

export interface TuiArgs {
  readonly log?: string;
  /** Plan files, in the order given (`--plan a --plan b` or `--plan a,b`). */
  readonly plans: readonly string[];
  readonly operator?: string;
  readonly isHelp: boolean;
}

/**
 * The bench screen's options. `--plan` may repeat or take a comma list, which
 * the shared parser does not do, so the screen reads its own few options here.
 */
export function parseTuiArgs(argv: readonly string[]): TuiArgs {
  let log: string | undefined;
  let operator: string | undefined;
  const plans: string[] = [];
  let isHelp = false;
  for (let i = 0; i < argv.length; i++) {
    const word = argv[i] ?? '';
    if (word === '--help' || word === '-h') {
      isHelp = true;
      continue;
    }
    if (!word.startsWith('--')) throw new UsageError(`unexpected argument ${JSON.stringify(word)}; usage: ${tuiUsage}`);
    const eq = word.indexOf('=');
    const name = eq >= 0 ? word.slice(2, eq) : word.slice(2);
    if (name !== 'log' && name !== 'plan' && name !== 'operator') {
      throw new UsageError(`unknown option --${name}; usage: ${tuiUsage} (or a command: probebook --help)`);
    }
    let value: string | undefined;
    if (eq >= 0) value = word.slice(eq + 1);
    else {
      value = argv[i + 1];
      i++;
    }
    if (value === undefined || value.trim() === '') throw new UsageError(`--${name} needs a value; usage: ${tuiUsage}`);
    if (name === 'log') log = value;
    else if (name === 'operator') operator = value.trim();
    else plans.push(...value.split(',').map((p) => p.trim()).filter((p) => p !== ''));
  }
  return { ...(log !== undefined ? { log } : {}), ...(operator !== undefined ? { operator } : {}), plans, isHelp };
}

/** `--operator`, else `$PROBEBOOK_OPERATOR`, else `$USER`, else `unknown` (as `probebook record`). */
export function operatorFrom(flag: string | undefined, env: NodeJS.ProcessEnv): string {
  return flag || env.PROBEBOOK_OPERATOR || env.USER || 'unknown';
}
