import type { Key } from 'ink';

/**
 * The keys in one chunk of input. A busy event loop or a terminal multiplexer
 * can deliver several typed keys at once (`"jjh"`); Ink then reports them as
 * one input, so a screen that compares `input === 'j'` would drop them all.
 * Plain printable chunks are split into single keys; anything else is one key.
 */
export function splitKeys(input: string, key: Key): readonly string[] {
  if (input.length <= 1 || key.ctrl || key.meta || /[\u0000-\u001F\u007F]/.test(input)) return [input];
  return [...input];
}

/**
 * How many characters a key erases. One Backspace or Delete is 1; a run of
 * them delivered in one chunk (a held key over ssh or tmux: `"\x7f\x7f\x7f"`)
 * reaches Ink as an unnamed key whose input is the raw run, so it is counted
 * here — otherwise a text field would drop it and erase nothing.
 */
export function erasures(input: string, key: Key): number {
  if (key.backspace || key.delete) return 1;
  return /^[\u0008\u007F]+$/.test(input) ? input.length : 0;
}
