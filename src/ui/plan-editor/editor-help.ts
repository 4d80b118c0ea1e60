import type { HelpEntry } from '../components/help-box.js';
import type { KeyHint } from '../components/key-bar.js';

export const editorHelp: readonly HelpEntry[] = [
  ['↑ ↓ / j k', 'move through the form (PgUp PgDn g G: page, first, last)'],
  ['Enter / e', 'type into the field (Enter keeps it, Esc drops it); on "input" choose'],
  ['← →', "choose a stage's input among the upstream outputs"],
  ['a', 'add a stage from the catalog of kinds'],
  ['r', 'add a rail'],
  ['d / Delete', 'remove the selected stage or rail (asks first)'],
  ['[ ]', 'move the selected stage up or down'],
  ['s / Ctrl-S', 'save (only a plan that loads; the old file is kept as FILE.bak)'],
  ['Esc / q', 'leave (asks when there are unsaved changes)'],
  ['?', 'this help'],
];

export const editorNotes: readonly string[] = [
  'Values are typed as at the bench: 4k7 1%, 22n 5%, 12 V, 1 kHz 0.1%. The field says at once what it reads, or why it cannot. ✗ marks a row with a problem; save goes to the first.',
  'Targets follow every change: the nominal at once with both bands estimated from the sensitivities (marked ≈), then the searched worst case and the statistical band (Monte Carlo), shown as refining until done.',
  'Caution: first power goes through a current-limited supply; mind hot parts and charged capacitors; anything mains-powered follows local codes and licensed practice.',
];

export const editorKeys: readonly KeyHint[] = [
  ['Enter', 'edit'],
  ['a', 'stage'],
  ['d', 'remove'],
  ['[ ]', 'move'],
  ['s', 'save'],
  ['Esc', 'leave'],
  ['?', 'help'],
];
