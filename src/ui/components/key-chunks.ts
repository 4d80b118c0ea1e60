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
 * The keys of a chunk, each with what follows it in the chunk, for a screen
 * where a key may open a text field: that key hands the rest of the chunk to
 * the field instead of acting on it (`"/CAL"` filters by CAL). The printable
 * keys before the first control character come one by one; a chunk that is
 * one key (a control key, an escape sequence, Ctrl or Meta) comes whole.
 * When no key opens a field, what follows the first control character is not
 * a key of this screen and is dropped, as a chunk with one always was.
 */
export function keysWithRest(input: string, key: Key): readonly { readonly input: string; readonly rest: string }[] {
  const chars = [...input];
  if (chars.length <= 1 || key.ctrl || key.meta || /^[\u0000-\u001F\u007F]/.test(input)) return [{ input, rest: '' }];
  const out: { input: string; rest: string }[] = [];
  // The rest is cut from the input at the key's end (in UTF-16 units: a key may be a surrogate pair), not joined again per key.
  let end = 0;
  for (const ch of chars) {
    if (/[\u0000-\u001F\u007F]/.test(ch)) break;
    end += ch.length;
    out.push({ input: ch, rest: input.slice(end) });
  }
  return out;
}
