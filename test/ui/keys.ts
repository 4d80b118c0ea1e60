// Named keys for ink-testing-library's `stdin.write`, as a terminal sends them
// (VT100/xterm sequences; common practice, no source).
export const keys = {
  enter: '\r',
  escape: '\u001B',
  tab: '\t',
  shiftTab: '\u001B[Z',
  backspace: '\u007F',
  delete: '\u001B[3~',
  up: '\u001B[A',
  down: '\u001B[B',
  right: '\u001B[C',
  left: '\u001B[D',
  pageUp: '\u001B[5~',
  pageDown: '\u001B[6~',
  home: '\u001B[H',
  end: '\u001B[F',
  ctrlC: '\u0003',
  space: ' ',
} as const;
