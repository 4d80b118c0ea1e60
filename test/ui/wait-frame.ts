/**
 * Waiting for the screen instead of sleeping (STYLE §16): write keys, then
 * wait until the frame changes or shows an expected text, with a bounded
 * timeout. After the frame, the handlers React swaps in after drawing it
 * (Ink's key listeners among them) are let run before the next key.
 */

/** What the helpers need of an ink-testing-library render. */
export interface Rendered {
  readonly stdin: { write: (data: string) => void };
  readonly frames: readonly string[];
  readonly lastFrame: () => string | undefined;
}

export type Expectation = string | RegExp | ((frame: string) => boolean);

const turn = () => new Promise<void>((resolve) => setImmediate(resolve));
const pause = () => new Promise<void>((resolve) => setTimeout(resolve, 5));

const matches = (frame: string, what: Expectation): boolean =>
  typeof what === 'function' ? what(frame) : typeof what === 'string' ? frame.includes(what) : what.test(frame);

/** Let React run the effects of the frame just drawn (listeners attach there). */
export async function afterFrame(): Promise<void> {
  await turn();
  await turn();
}

/** Wait until the screen shows `what`; fails after `timeoutMs` with the last frame. */
export async function waitForFrame(ui: Rendered, what: Expectation, timeoutMs = 8000): Promise<string> {
  const until = Date.now() + timeoutMs;
  while (!matches(ui.lastFrame() ?? '', what)) {
    if (Date.now() > until) throw new Error(`timed out waiting for ${String(what)}; the screen shows:\n${ui.lastFrame() ?? ''}`);
    await pause();
  }
  await afterFrame();
  return ui.lastFrame() ?? '';
}

/**
 * Write one chunk and wait for the frame it causes: until `what` shows when
 * given (else fail), or else until a new frame is drawn — a key that changes
 * nothing on screen draws none, so that wait ends after `quietMs`.
 */
export async function writeAndWait(ui: Rendered, chunk: string, what?: Expectation, { timeoutMs = 8000, quietMs = 400 } = {}): Promise<string> {
  const before = ui.frames.length;
  const previous = ui.lastFrame();
  ui.stdin.write(chunk);
  if (what !== undefined) return waitForFrame(ui, what, timeoutMs);
  const until = Date.now() + quietMs;
  while (ui.frames.length === before && ui.lastFrame() === previous && Date.now() < until) await pause();
  await afterFrame();
  return ui.lastFrame() ?? '';
}
