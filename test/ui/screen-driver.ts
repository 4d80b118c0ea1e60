import type { render } from 'ink-testing-library';

/** Wait-and-press helpers around one rendered screen (ink-testing-library). */
export function driveScreen(r: ReturnType<typeof render>) {
  const frame = () => r.lastFrame() ?? '';
  /** Poll until the frame shows `text`; fails with the last frame. */
  const waitFor = async (text: string | RegExp, timeoutMs = 8000) => {
    const until = Date.now() + timeoutMs;
    while (!(typeof text === 'string' ? frame().includes(text) : text.test(frame()))) {
      if (Date.now() > until) throw new Error(`timed out waiting for ${String(text)}; the screen shows:\n${frame()}`);
      await new Promise((res) => setTimeout(res, 20));
    }
  };
  const press = async (key: string) => {
    r.stdin.write(key);
    await new Promise((res) => setTimeout(res, 40));
  };
  return { ...r, frame, waitFor, press };
}
