import { spawnSync } from 'node:child_process';

/**
 * One tmux session for an end-to-end test: the real command in a real terminal,
 * keys in with send-keys, the screen back from capture-pane. No fixed sleeps:
 * `screen` polls until the terminal shows what is expected, or says what it shows.
 */
export interface TmuxSession {
  /** The session's name, unique to this process and moment. */
  readonly name: string;
  /** Run a tmux command; throws with tmux's own words when it fails. */
  tmux(...args: string[]): string;
  /** Start `command` in a detached window of `width`×`height` (80×24 when not given). */
  start(command: string, width?: number, height?: number): void;
  /** The screen as text (with `withEscapes`, its colour and style sequences too). */
  capture(withEscapes?: boolean): string;
  /** Send keys by tmux name (`Enter`, `Escape`, `BSpace`, `j`). */
  keys(...names: string[]): string;
  /** Type text literally, one key at a time, as a person does. */
  typeText(text: string): Promise<void>;
  /** Wait until the screen contains `expected` (or matches it); returns that screen. */
  screen(expected: string | RegExp, timeoutMs?: number): Promise<string>;
  resize(width: number, height: number): void;
  /** End the session (nothing happens when it has already ended). */
  kill(): void;
}

export function tmuxSession(prefix: string, defaultTimeoutMs = 20_000): TmuxSession {
  const name = `${prefix}-${process.pid}-${Date.now().toString(36)}`;
  const tmux = (...args: string[]): string => {
    const r = spawnSync('tmux', args, { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`tmux ${args.join(' ')} failed: ${r.stderr}`);
    return r.stdout;
  };
  const capture = (withEscapes = false) => tmux('capture-pane', '-p', ...(withEscapes ? ['-e'] : []), '-t', name);
  return {
    name,
    tmux,
    capture,
    start: (command, width = 80, height = 24) => {
      tmux('new-session', '-d', '-s', name, '-x', String(width), '-y', String(height), command);
    },
    keys: (...names) => tmux('send-keys', '-t', name, ...names),
    typeText: async (text) => {
      for (const ch of text) {
        tmux('send-keys', '-t', name, '-l', ch);
        await new Promise((r) => setTimeout(r, 15));
      }
    },
    screen: async (expected, timeoutMs = defaultTimeoutMs) => {
      const until = Date.now() + timeoutMs;
      for (;;) {
        const last = capture();
        if (typeof expected === 'string' ? last.includes(expected) : expected.test(last)) return last;
        if (Date.now() > until) throw new Error(`the terminal never showed ${String(expected)}; it shows:\n${last}`);
        await new Promise((r) => setTimeout(r, 100));
      }
    },
    resize: (width, height) => {
      tmux('resize-window', '-t', name, '-x', String(width), '-y', String(height));
    },
    kill: () => {
      spawnSync('tmux', ['kill-session', '-t', name]);
    },
  };
}
