import type { HelpEntry } from '../components/help-box.js';

export const attachHelp: readonly HelpEntry[] = [
  ['path', 'a CSV or WAV capture saved from the scope; ~ and relative paths work'],
  ['--dt 1us', 'the sample interval, for a CSV without a time column'],
  ['--scale 10', 'volts per unit, for a WAV or a CSV in divisions or raw counts'],
  ['--channel 2', 'which channel of a file with several'],
  ['Tab', 'complete the file name (several names: the common start, and the list)'],
  ['← → Home End', 'move in the path; Backspace erases; Ctrl-U clears it'],
  ['Enter', 'read the file and show its figures; Enter again attaches them'],
  ['Esc', 'stop waiting, pick another file, or close the box'],
  ['?', 'this help (in an empty path field); ? or Esc closes it'],
];

export const attachNotes: readonly string[] = [
  'The file is copied into the log by its hash; the figures become readings of every check at the same test point that the capture measures and that may be read now.',
];
