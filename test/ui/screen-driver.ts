import type { render } from 'ink-testing-library';
import { keys } from './keys.js';
import { waitForFrame, writeAndWait } from './wait-frame.js';

/** Wait-and-press helpers around one rendered screen (ink-testing-library). */
export function driveScreen(r: ReturnType<typeof render>) {
  const frame = () => r.lastFrame() ?? '';
  /** Poll until the frame shows `text`; fails with the last frame. */
  const waitFor = async (text: string | RegExp, timeoutMs = 8000) => {
    await waitForFrame(r, text, timeoutMs);
  };
  /** Write a key and wait for the frame it draws (bounded when it changes nothing). */
  const press = async (key: string) => {
    await writeAndWait(r, key);
  };
  return { ...r, frame, waitFor, press };
}

/** A screen that can be read and pressed (a `driveScreen` result, or `renderApp`'s). */
export interface Pressable {
  frame(): string;
  press(key: string): Promise<unknown>;
}

/** Move down until the selected line (the one starting with the pointer ›) shows `label`; fails with the screen. */
export async function selectRow(s: Pressable, label: RegExp, maxMoves = 80): Promise<void> {
  for (let i = 0; i < maxMoves; i++) {
    const line = s
      .frame()
      .split('\n')
      .find((l) => l.startsWith('›'));
    if (line && label.test(line)) return;
    await s.press(keys.down);
  }
  throw new Error(`no row ${String(label)}; the screen shows:\n${s.frame()}`);
}
