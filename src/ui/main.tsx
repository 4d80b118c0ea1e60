import { render } from 'ink';
import type { Command } from '../cli/command.js';
import { resolveLogDir } from '../cli/log-dir.js';
import { openLog } from '../log/store.js';
import { loadPlanFile } from '../plan/load.js';
import { App } from './app.js';
import { PlanCatalog } from './bench/plan-catalog.js';
import { operatorFrom, parseTuiArgs, tuiUsage } from './tui-args.js';

export const notTerminalMessage =
  'probebook: the bench screen needs a terminal; use probebook targets|record|history|batch|report for scripts\n';

// The alternate screen buffer (xterm, common practice): the bench screen gets the
// whole window, and the shell's scrollback comes back unchanged on quit.
const enterAltScreen = '\u001B[?1049h\u001B[H';
const leaveAltScreen = '\u001B[?1049l';

/** `probebook [--log DIR] [--plan FILE]... [--operator NAME]`: the bench screen. */
export const tuiCommand: Command = async (argv, io) => {
  const args = parseTuiArgs(argv);
  if (args.isHelp) {
    io.stdout(`usage: ${tuiUsage}\n  the bench screen; ? shows the keys on every screen; probebook --help lists the commands\n`);
    return 0;
  }
  if (!process.stdin.isTTY || !process.stdout.isTTY) {
    io.stderr(notTerminalMessage);
    return 2;
  }
  const log = await openLog(resolveLogDir(args.log, io.env));
  const plans = [];
  for (const file of args.plans) plans.push(await loadPlanFile(file, { cwd: io.cwd }));
  const catalog = new PlanCatalog(log, plans);
  const operator = operatorFrom(args.operator, io.env);

  process.stdout.write(enterAltScreen);
  const restore = () => process.stdout.write(leaveAltScreen);
  process.once('exit', restore);
  try {
    const app = render(<App log={log} catalog={catalog} operator={operator} />, { exitOnCtrlC: true });
    await app.waitUntilExit();
  } finally {
    process.off('exit', restore);
    restore();
  }
  return 0;
};
