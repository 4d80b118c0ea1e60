import { render } from 'ink';
import type { Command } from './command.js';
import { resolveLogDir } from './log-dir.js';
import { openStore } from '../log/open-store.js';
import { App } from '../ui/app.js';
import { UsageError } from './errors.js';
import { maxOperatorLength, oneLine } from '../units/text.js';
import { startMark } from './start-marks.js';
import type { PlanFileText, TuiServices } from './tui-services.js';
import { readPlanFile } from '../plan/read-file.js';
import { cacheHelp } from './cache-help.js';

// What the bench screen's first frame needs is imported above and nothing more
// (measured in bench/ui.bench.ts): the plan loader with its schema library, the
// stage models, the targets engine and the instruments load after that frame.

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

/** Later than Ink's 30 fps render throttle (33 ms): the frame with the boards is on the terminal before the plans load. */
const servicesDelayMs = 40;

/** `probebook [--log DIR] [--plan FILE]... [--operator NAME]`: the bench screen. */
export const tuiCommand: Command = async (argv, io) => {
  startMark('tui');
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
  startMark('log-open');
  // A missing or unreadable --plan is said before the screen opens; what the text says is checked after its first frame.
  const planTexts: PlanFileText[] = [];
  for (const file of args.plans) planTexts.push({ file, text: await readPlanFile(file, { cwd: io.cwd }) });
  const operator = operatorFrom(args.operator, io.env);
  // Cache problems are said after the screen closes: a line on stderr would tear the frame.
  const notices: string[] = [];
  // The plans, the targets cache and the instruments load once the bench screen
  // shows its boards; a bad --plan or instruments file then closes the screen
  // and is said as before (one line, exit 2).
  let failure: unknown = null;
  let start!: () => void;
  const services = new Promise<TuiServices>((resolve) => {
    start = () => resolve(import('./tui-services.js').then((m) => m.loadTuiServices(args, planTexts, log, io, (text) => notices.push(text))));
  });
  let isStarted = false;
  let timer: NodeJS.Timeout | undefined;
  const onShown = () => {
    if (isStarted) return;
    isStarted = true;
    startMark('shown');
    timer = setTimeout(start, servicesDelayMs);
  };
  const catalog = services.then((s) => s.catalog);
  const instruments = services.then((s) => s.instruments);
  const planEditing = services.then((s) => s.planEditing);
  // The screen hears of a failure through these; the failure itself is handled below.
  for (const p of [catalog, instruments, planEditing]) p.catch(() => undefined);

  process.stdout.write(enterAltScreen);
  const restore = () => process.stdout.write(leaveAltScreen);
  process.once('exit', restore);
  try {
    startMark('render');
    const app = render(<App log={log} catalog={catalog} operator={operator} instruments={instruments} planEditing={planEditing} onShown={onShown} />, {
      exitOnCtrlC: true,
    });
    startMark('rendered');
    services.then(
      () => startMark('services'),
      (error: unknown) => {
        failure = error;
        app.unmount();
      },
    );
    await app.waitUntilExit();
  } finally {
    // Nothing more is loaded for a screen that is gone; what was opened is closed.
    clearTimeout(timer);
    void services.then(
      (s) => s.instruments?.close(),
      () => undefined,
    );
    process.off('exit', restore);
    restore();
    for (const text of notices) io.stderr(text);
  }
  if (failure !== null) throw failure;
  return 0;
};
