import type { HelpEntry } from '../components/help-box.js';
import type { KeyHint } from '../components/key-bar.js';

export const batchHelp: readonly HelpEntry[] = [
  ['↑ ↓  j k', 'choose a check (or an outlier board in the outliers panel)'],
  ['Tab', 'next panel: histogram, trend, outliers (Shift+Tab back)'],
  ['Enter', 'on a check: its outlier boards; on an outlier: open its history'],
  ['f', 'filter by plan, plan revision (hash) and date range'],
  ['Esc', 'back; from the table, leave the batch'],
  ['?', 'this help'],
];

export const batchNotes: readonly string[] = [
  'Figures use the latest reading of each check on each board. Cp and Cpk are taken against the worst-case band of the newest plan revision measured; a Cpk of 1.33 or more is the usual aim.',
  'Histogram marks: [ ] band edges, N nominal. Outliers lie outside their band or beyond 3σ of the mean.',
];

export const batchHints: readonly KeyHint[] = [
  ['↑↓', 'check'],
  ['Tab', 'panel'],
  ['Enter', 'open'],
  ['f', 'filter'],
  ['Esc', 'back'],
  ['?', 'help'],
];

/** The filter form's own help (`?` in an empty field). */
export const filterFormHelp: readonly HelpEntry[] = [
  ['text', 'plan id; revision (at least 4 hex digits of the plan hash); from and to (2026-11-30 or 2026-11-30T14:00:00Z)'],
  ['Tab ↓ / ↑', 'next / previous field'],
  ['← → Home End', 'move in the field; Backspace erases; Ctrl-U clears it'],
  ['Enter', 'apply the filter (a bad date is named, and the form stays open)'],
  ['Esc', 'close the form, keeping the filter as it was'],
  ['?', 'this help (in an empty field); ? or Esc closes it'],
];

export const filterFormNotes: readonly string[] = ['An empty field means any. Dates without a time cover the whole day.'];
