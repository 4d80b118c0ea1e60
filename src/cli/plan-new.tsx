import { readFile } from 'node:fs/promises';
import { basename, resolve } from 'node:path';
import { render } from 'ink';
import { type Draft, newDraft, parseDraft } from '../plan/draft.js';
import { findJsonFault } from '../plan/json-position.js';
import { PlanEditorApp } from '../ui/plan-editor/plan-editor-app.js';
import { parseArgs } from './args.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';
import { savePlanText } from './plan-save.js';
import { notTerminalMessage } from './tui.js';

const usage = 'probebook plan new FILE';

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
