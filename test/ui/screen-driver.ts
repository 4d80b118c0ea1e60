import type { render } from 'ink-testing-library';
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
