import type { HelpEntry } from '../components/help-box.js';
import type { KeyHint } from '../components/key-bar.js';

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

export const benchNotes: readonly string[] = [
  'States: · untouched  ▶ in progress  ✓ passed  ✗ failed  ↻ reworked (rework noted after a failed run).',
  'Before first power: check the rails for shorts unpowered, mind polarity, and power up through a current-limited supply. Parts can run hot and capacitors stay charged after power-off. Anything mains-powered: follow local codes and licensed practice.',
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
