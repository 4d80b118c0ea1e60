import type { HelpEntry } from '../components/help-box.js';

export const bringUpHelp: readonly HelpEntry[] = [
  ['type + Enter', 'record a reading for the check in the panel (4.98k, 4k98, 4.98 kHz, -11.9, 12.1V, OL)'],
  ['Enter (empty)', 'take the suggested next check'],
  ['Tab', 'switch between the input and the stage list'],
  ['↑↓ j k', 'move in the stage list; Enter picks the check'],
  ['r', 'note a rework (part, from, to, note); the reworked stage is measured again'],
  ['a', 'attach a capture file to the check'],
  ['e', 'end the run (passed once every check reads, failed, aborted)'],
  ['Esc', 'clear the input, or go back to the bench'],
  ['?', 'this help'],
];

export const bringUpNotes: readonly string[] = [
  'Marks: ✓ pass · ≈ marginal (reading ± uncertainty straddles a band edge) · ✗ fail · ↻ measure again after a rework · · not measured · ⊘ locked until the safety checks are done.',
  'A reading is shown as saved only once the log has it on disk.',
];
