import type { HelpEntry } from '../components/help-box.js';
import type { KeyHint } from '../components/key-bar.js';
import type { DialogMode } from './use-bench-state.js';

export const benchHelp: readonly HelpEntry[] = [
  ['↑ ↓ / j k', 'move through the boards (PgUp PgDn, g G: page, first, last)'],
  ['Enter', 'open the board: resume its unfinished run, or start a new run'],
  ['n', 'new board: type its serial, then choose its plan'],
  ['/', 'filter the boards by serial or plan id'],
  ['h', 'history of the selected board'],
  ['b', 'batch review of all boards'],
  ['p', 'plan screen: the targets of the selected board’s plan, for design review'],
  ['Esc', 'clear the filter, or go back from another screen'],
  ['?', 'this help'],
  ['q', 'quit (asks first when a reading is half typed)'],
];

const benchCaution =
  'Before first power: check the rails for shorts unpowered, mind polarity, and power up through a current-limited supply. Parts can run hot and capacitors stay charged after power-off. Anything mains-powered: follow local codes and licensed practice.';

export const benchNotes: readonly string[] = [
  'States: · untouched  ▶ in progress  ✓ passed  ✗ failed  ↻ reworked (rework noted after a failed run).',
  benchCaution,
];

export const benchKeys: readonly KeyHint[] = [
  ['↑↓', 'move'],
  ['Enter', 'open'],
  ['n', 'new board'],
  ['/', 'filter'],
  ['h', 'history'],
  ['b', 'batch'],
  ['p', 'plan'],
  ['q', 'quit'],
  ['?', 'help'],
];

/** What the help box is titled and lists for the screen or the dialog `?` was pressed in. */
export function benchHelpFor(from: DialogMode): { readonly topic?: string; readonly entries: readonly HelpEntry[]; readonly notes: readonly string[] } {
  switch (from.kind) {
    case 'confirm-run':
      return {
        topic: 'starting a run',
        entries: [
          ['Enter / y', `start a new run on ${from.board.serial} with plan ${from.plan.plan}; the bring-up screen opens at the unpowered checks`],
          ['Esc / n', 'back to the boards; nothing is written to the log'],
          ['?', 'this help'],
        ],
        notes: ['A new run keeps the board’s earlier runs in its history; its readings start afresh.', benchCaution],
      };
    case 'choose-plan':
      return {
        topic: 'choosing a plan',
        entries: [
          ['↑ ↓ / j k', 'move through the plans'],
          ['Enter', `start the first run of ${from.serial} with the plan under the cursor`],
          ['Esc', 'back to the boards; the new board is not written to the log yet'],
          ['?', 'this help'],
        ],
        notes: ['Plans come from --plan files and from the plans earlier runs in this log used.', benchCaution],
      };
    case 'new-serial':
      return {
        topic: 'a new board',
        entries: [
          ['text', 'the serial as printed on the board (letters, digits, - _ .)'],
          ['← → Home End', 'move in the text; Backspace erases; Ctrl-U clears'],
          ['Enter', 'go on to choose its plan'],
          ['Esc', 'cancel'],
          ['?', 'this help (in an empty field)'],
        ],
        notes: [],
      };
    case 'filter':
      return {
        topic: 'filtering the boards',
        entries: [
          ['text', 'part of a serial or plan id; the list narrows as you type'],
          ['Enter', 'keep the filter'],
          ['Esc', 'clear it'],
          ['?', 'this help (in an empty field)'],
        ],
        notes: [],
      };
    default:
      return { entries: benchHelp, notes: benchNotes };
  }
}
