import { render } from 'ink';
import type { Command } from './command.js';
import { resolveLogDir } from './log-dir.js';
import { openStore } from '../log/open-store.js';
import { loadPlanFile } from '../plan/load.js';
import { App } from '../ui/app.js';
import { PlanCatalog } from '../ui/bench/plan-catalog.js';
import { UsageError } from './errors.js';
import { existsSync } from 'node:fs';
import { instrumentsPath, loadInstruments } from '../bench/instruments-file.js';
import { BenchSession } from '../bench/session.js';
import { type InstrumentSource, sessionSource } from '../bench/source.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';
import { planEditAccess } from './plan-draft-file.js';
import { maxOperatorLength, oneLine } from '../units/text.js';

export const tuiUsage = 'probebook [--log DIR] [--plan FILE]... [--operator NAME] [--cache DIR]';

export interface TuiArgs {
  readonly log?: string;
  /** Plan files, in the order given (`--plan a --plan b` or `--plan a,b`). */
  readonly plans: readonly string[];
  readonly operator?: string;
  /** The targets cache folder (`--cache`). */
  readonly cache?: string;
  /** The bench's instruments file (`--instruments`). */
  readonly instruments?: string;
  readonly isHelp: boolean;
}

/**
 * The bench screen's options. `--plan` may repeat or take a comma list, which
 * the shared parser does not do, so the screen reads its own few options here.
 */
export function parseTuiArgs(argv: readonly string[]): TuiArgs {
  let log: string | undefined;
  let operator: string | undefined;
  let cache: string | undefined;
  let instruments: string | undefined;
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
    if (name !== 'log' && name !== 'plan' && name !== 'operator' && name !== 'cache' && name !== 'instruments') {
      throw new UsageError(`unknown option --${name}; usage: ${tuiUsage} (or a command: probebook --help)`);
    }
    let value: string | undefined;
    if (eq >= 0) value = word.slice(eq + 1);
    else {
      value = argv[i + 1];
      i++;
    }
    if (value === undefined || value.trim() === '') throw new UsageError(`--${name} needs a value; usage: ${tuiUsage}`);
    // As the commands' parser: a flag is never taken as a value, and only --plan may repeat.
    if (value.startsWith('-'))
      throw new UsageError(`--${name} needs a value, but ${JSON.stringify(value.slice(0, 40))} looks like an option; usage: ${tuiUsage}`);
    if (
      (name === 'log' && log !== undefined) ||
      (name === 'cache' && cache !== undefined) ||
      (name === 'operator' && operator !== undefined) ||
      (name === 'instruments' && instruments !== undefined)
    )
      throw new UsageError(`--${name} is given twice; give it once`);
    if (name === 'log') log = value;
    else if (name === 'cache') cache = value;
    else if (name === 'instruments') instruments = value;
    else if (name === 'operator') operator = value.trim();
    else
      plans.push(
        ...value
          .split(',')
          .map((p) => p.trim())
          .filter((p) => p !== ''),
      );
  }
  return {
    ...(log !== undefined ? { log } : {}),
    ...(operator !== undefined ? { operator } : {}),
    ...(cache !== undefined ? { cache } : {}),
    ...(instruments !== undefined ? { instruments } : {}),
    plans,
    isHelp,
  };
}

/** `--operator`, else `$PROBEBOOK_OPERATOR`, else `$USER`, else `unknown` (as `probebook record`). */
export function operatorFrom(flag: string | undefined, env: NodeJS.ProcessEnv): string {
  // One clean line of at most 64 characters: no escape sequence or line break reaches the log.
  for (const v of [flag, env.PROBEBOOK_OPERATOR, env.USER]) {
    const name = oneLine(v ?? '').slice(0, maxOperatorLength);
    if (name !== '') return name;
  }
  return 'unknown';
}

export const notTerminalMessage = 'probebook: the bench screen needs a terminal; use probebook targets|record|history|batch|report for scripts\n';

// The alternate screen buffer (xterm, common practice): the bench screen gets the
// whole window, and the shell's scrollback comes back unchanged on quit.
const enterAltScreen = '\u001B[?1049h\u001B[H';
const leaveAltScreen = '\u001B[?1049l';

/** `probebook [--log DIR] [--plan FILE]... [--operator NAME]`: the bench screen. */
/**
 * The bench's instruments for the bring-up screen's `m` key: the file named by
 * --instruments (an error when missing), else $PROBEBOOK_INSTRUMENTS or the
 * user's config file when present (none is fine: the key then says how to set one up).
 */
async function benchInstruments(flag: string | undefined, env: NodeJS.ProcessEnv, cwd: string): Promise<InstrumentSource | null> {
  const path = instrumentsPath(flag, env, cwd);
  if (flag === undefined && !env.PROBEBOOK_INSTRUMENTS && !existsSync(path)) return null;
  const file = await loadInstruments(path);
  return sessionSource(file, new BenchSession(file));
}

export const tuiCommand: Command = async (argv, io) => {
  const args = parseTuiArgs(argv);
  if (args.isHelp) {
    io.stdout(`usage: ${tuiUsage}\n  the bench screen; ? shows the keys on every screen; probebook --help lists the commands\n${cacheHelp}`);
    return 0;
  }
  if (!process.stdin.isTTY || !process.stdout.isTTY) {
    io.stderr(notTerminalMessage);
    return 2;
  }
  const log = await openStore(resolveLogDir(args.log, io.env));
  const plans = [];
  for (const file of args.plans) plans.push(await loadPlanFile(file, { cwd: io.cwd }));
  // Cache problems are said after the screen closes: a line on stderr would tear the frame.
  const notices: string[] = [];
  const targetsCache = targetsCacheFor(args.cache, { env: io.env, stderr: (text) => notices.push(text) });
  const catalog = new PlanCatalog(log, plans, { targetsCache });
  const operator = operatorFrom(args.operator, io.env);
  const instruments = await benchInstruments(args.instruments, io.env, io.cwd);

  process.stdout.write(enterAltScreen);
  const restore = () => process.stdout.write(leaveAltScreen);
  process.once('exit', restore);
  try {
    const app = render(<App log={log} catalog={catalog} operator={operator} instruments={instruments} planEditing={planEditAccess(io.cwd)} />, {
      exitOnCtrlC: true,
    });
    await app.waitUntilExit();
  } finally {
    instruments?.close();
    process.off('exit', restore);
    restore();
    for (const text of notices) io.stderr(text);
  }
  return 0;
};
