import type { HelpEntry } from '../components/help-box.js';
import type { KeyHint } from '../components/key-bar.js';

export const planHelp: readonly HelpEntry[] = [
  ['↑ ↓ / j k', 'move through the targets, or scroll the warnings'],
  ['PgUp PgDn g G', 'page up, page down, first, last'],
  ['Tab', 'switch between the targets table and the design warnings'],
  ['e', 'edit this plan in the plan editor (how it is saved: below)'],
  ['Esc', 'back to the bench'],
  ['?', 'this help'],
  ['q', 'quit'],
];

export const planNotes: readonly string[] = [
  'The worst-case band covers every corner of the parts’ tolerances; the statistical band is the 0.135–99.865 % interval of a seeded Monte Carlo over all parts at once. A reading passes when it lies inside the worst-case band by at least the instrument’s uncertainty (the guard band).',
  'Top contributor: the part whose tolerance accounts for the largest share of the band. Review the warnings before first power.',
];

/** Said in the help when the screen can open the editor (`e`). */
export const planEditNote =
  'e opens the plan editor on this plan: a plan given with --plan is saved over its file (the old one kept as FILE.bak), a plan the log alone keeps as a new file in the folder probebook started in. Boards already run keep the plan they used.';

export const planKeys: readonly KeyHint[] = [
  ['↑↓', 'move'],
  ['Tab', 'warnings'],
  ['e', 'edit'],
  ['Esc', 'back'],
  ['q', 'quit'],
  ['?', 'help'],
];
