import type { HelpEntry } from '../components/help-box.js';
import type { KeyHint } from '../components/key-bar.js';

export const historyHelp: readonly HelpEntry[] = [
  ['↑ ↓  j k', 'move in the timeline or the rework notes'],
  ['PgUp PgDn', 'move a page; g and G go to the first and last entry'],
  ['Enter', 'open: a reading shows its target as it was when measured'],
  ['', 'a capture is drawn; a rework note opens the before/after panel'],
  ['c', 'draw the capture a reading came from'],
  ['Tab', 'switch between the timeline and rework before/after'],
  ['Esc', 'back; from the timeline, leave the history'],
  ['?', 'this help'],
];

export const historyNotes: readonly string[] = [
  'Times are UTC. Marks: ✓ pass, ≈ marginal, ✗ fail, ↻ rework, ∿ capture, ! warning.',
  'Deviation is from the nominal of the plan revision the reading was judged by.',
];

export const historyHints: readonly KeyHint[] = [
  ['↑↓', 'move'],
  ['Enter', 'open'],
  ['Tab', 'panel'],
  ['Esc', 'back'],
  ['?', 'help'],
];
