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
