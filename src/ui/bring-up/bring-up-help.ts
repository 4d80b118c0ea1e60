import type { HelpEntry } from '../components/help-box.js';

export const bringUpHelp: readonly HelpEntry[] = [
  ['type + Enter', 'record a reading for the check in the panel (4.98k, 4k98, 4.98 kHz, -11.9, 12.1V, OL)'],
  ['Enter (empty)', 'take the suggested next check'],
  ['Tab', 'switch between the input and the stage list'],
  ['↑↓ j k', 'move in the stage list; Enter picks the check'],
  ['r', 'note a rework (part, from, to, note); the reworked stage is measured again'],
  ['a', 'attach a capture file to the check'],
  ['m', 'read the check from its bench instrument (SCPI; Esc cancels the wait)'],
  ['M', 'five readings from the instrument, recorded as their mean (their spread widens the guard band)'],
  ['e', 'end the run (passed once every check reads, failed, aborted)'],
  ['Esc', 'clear the input, or go back to the bench'],
  ['?', 'this help'],
];

export const bringUpNotes: readonly string[] = [
  'Marks: ✓ pass · ≈ marginal (reading ± uncertainty straddles a band edge) · ✗ fail · ↻ measure again after a rework · · not measured · ⊘ locked until the safety checks are done.',
  'A reading is shown as saved only once the log has it on disk.',
];

/** What `?` shows: the screen's help, or the help of the dialog it was pressed in. */
export function bringUpHelpFor(
  from: string,
  isPowerOff: boolean,
): { readonly topic?: string; readonly entries: readonly HelpEntry[]; readonly notes: readonly string[] } {
  if (isPowerOff)
    return {
      topic: 'power off',
      entries: [
        ['Enter', 'confirm the supply is off; the run goes on at the checks before power'],
        ['?', 'this help'],
      ],
      notes: [
        'The idle current was above the plan’s limit: switch the supply off before touching the board. Look for a short, a reversed part or a wrong rail before powering it again, through a current-limited supply.',
        'Parts may be hot and capacitors charged. Anything mains-powered: follow local codes and licensed practice.',
      ],
    };
  if (from === 'rework')
    return {
      topic: 'rework note',
      entries: [
        ['text', 'part as <stage>.<part> (osc.Ct), its value before (from) and after (to), and why (note)'],
        ['← → Home End', 'move in the field; Backspace erases; Ctrl-U clears it'],
        ['Tab Shift-Tab', 'next or previous field (Enter moves on too)'],
        ['Enter on note', 'save the note; the reworked stage and those after it are measured again'],
        ['Esc', 'close the form without saving'],
        ['?', 'this help (in an empty field)'],
      ],
      notes: ['Power the board off and let capacitors discharge before reworking it.'],
    };
  if (from === 'end')
    return {
      topic: 'ending the run',
      entries: [
        ['↑ ↓ / j k', 'choose the outcome (passed needs every check read)'],
        ['Enter', 'end the run with that outcome; it is saved in the log'],
        ['Esc', 'back to the checks'],
        ['?', 'this help'],
      ],
      notes: [],
    };
  return { entries: bringUpHelp, notes: bringUpNotes };
}
