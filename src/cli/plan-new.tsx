import { resolve } from 'node:path';
import { render } from 'ink';
import { PlanEditorApp } from '../ui/plan-editor/plan-editor-app.js';
import { parseArgs } from './args.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';
import { openDraft } from './plan-draft-file.js';
import { savePlanText } from './plan-save.js';
import { notTerminalMessage } from './tui.js';

const usage = 'probebook plan new FILE';

// The alternate screen buffer (xterm, common practice): the shell's scrollback comes back unchanged on leaving.
const enterAltScreen = '\u001B[?1049h\u001B[H';
const leaveAltScreen = '\u001B[?1049l';

/** `probebook plan new FILE` (DESIGN §7b): the plan editor screen on a new or existing plan. */
export const planNewCommand: Command = async (argv, io) => {
  const args = parseArgs(argv, { options: { help: 'boolean' }, positionals: [0, 1], usage });
  if (args.options.help) {
    io.stdout(
      `usage: ${usage}\n  the plan editor: a form for the board, its rails and stages with the targets beside it,\n  updated as you type; it saves only a plan that loads (the old file kept as FILE.bak).\n  FILE may be new. ? shows the keys on the screen.\n`,
    );
    return 0;
  }
  const file = args.positionals[0];
  if (file === undefined) throw new UsageError(`missing argument FILE; usage: ${usage}`);
  const path = resolve(io.cwd, file);
  const { draft, savedText } = await openDraft(path, file);
  if (!process.stdin.isTTY || !process.stdout.isTTY) {
    io.stderr(
      notTerminalMessage
        .replace('the bench screen needs a terminal', 'the plan editor needs a terminal')
        .replace(/use probebook .*$/m, `check a plan with probebook plan check ${file}`),
    );
    return 2;
  }
  process.stdout.write(enterAltScreen);
  const restore = () => process.stdout.write(leaveAltScreen);
  process.once('exit', restore);
  try {
    const app = render(<PlanEditorApp file={file} initial={draft} savedText={savedText} save={(text) => savePlanText(path, text, file)} />, {
      exitOnCtrlC: true,
    });
    await app.waitUntilExit();
  } finally {
    process.off('exit', restore);
    restore();
  }
  return 0;
};
