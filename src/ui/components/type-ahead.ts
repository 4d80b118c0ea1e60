import type { Key } from 'ink';

/** A key with no flag set: plain typed text. */
export const plainKey: Key = {
  upArrow: false,
  downArrow: false,
  leftArrow: false,
  rightArrow: false,
  pageDown: false,
  pageUp: false,
  home: false,
  end: false,
  return: false,
  escape: false,
  ctrl: false,
  shift: false,
  tab: false,
  backspace: false,
  delete: false,
  meta: false,
  super: false,
  hyper: false,
  capsLock: false,
  numLock: false,
};

/**
 * Keys typed for a text field before it is on screen. A key that opens a field
 * (`/`, `n`) often arrives with more behind it in the same chunk (a paste, fast
 * typing over ssh, a multiplexer's batch), and further chunks of the same read
 * reach the screen's handler before React has mounted the field. The screen
 * collects them here from the moment it opens the field; the field takes them
 * when it mounts (`useTextField`'s `typeAhead`), in order, as if typed into it.
 */
export class TypeAhead {
  private keys: { readonly input: string; readonly key: Key }[] = [];
  private collecting = false;

  /** Whether a field was opened and has not yet taken its keys. */
  get isCollecting(): boolean {
    return this.collecting;
  }

  /** A field is opening: keep what follows for it. */
  open(): void {
    this.keys = [];
    this.collecting = true;
  }

  push(input: string, key: Key): void {
    if (this.collecting && input !== '') this.keys.push({ input, key });
  }

  /** The keys kept so far; collecting stops (the field has the keyboard now). */
  drain(): readonly { readonly input: string; readonly key: Key }[] {
    const keys = this.keys;
    this.keys = [];
    this.collecting = false;
    return keys;
  }
}
