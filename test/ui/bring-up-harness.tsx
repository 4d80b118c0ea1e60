import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { afterEach, beforeAll } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import type { TargetSet } from '../../src/analysis/types.js';
import { openLog } from '../../src/log/store.js';
import type { BenchLog, BoardFile } from '../../src/log/types.js';
import { loadPlanFile } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { BringUpScreen } from '../../src/ui/bring-up/bring-up.js';
import type { InstrumentSource } from '../../src/bench/source.js';
import { keys } from './keys.js';
import { waitForFrame, writeAndWait } from './wait-frame.js';

export const fixturePlan = join(import.meta.dirname, 'fixtures', 'bring-up.plan.json');

/** The fixture plan and its targets, computed once (few trials: the verdicts need only the worst-case band). */
export async function loadFixture(file = fixturePlan): Promise<{ plan: Plan; targets: TargetSet }> {
  const plan = await loadPlanFile(file);
  return { plan, targets: computeTargets(plan, { trials: 400, seed: 1 }) };
}

export interface ScreenOptions {
  readonly width?: number;
  readonly height?: number;
  readonly resumeRun?: string;
  readonly serial?: string;
  readonly instruments?: InstrumentSource | null;
}

/** A bring-up screen on a real log in a temporary folder. */
export async function renderBringUp(fixture: { plan: Plan; targets: TargetSet }, log: BenchLog, options: ScreenOptions = {}) {
  const exits: number[] = [];
  const dirty: boolean[] = [];
  const serial = options.serial ?? 'FX-0001';
  const ui = render(
    <BringUpScreen
      log={log}
      plan={fixture.plan}
      targets={fixture.targets}
      serial={serial}
      operator="tester"
      width={options.width ?? 100}
      height={options.height ?? 32}
      onExit={() => exits.push(1)}
      onDirtyChange={(d) => dirty.push(d)}
      {...(options.resumeRun ? { resumeRun: options.resumeRun } : {})}
      {...(options.instruments ? { instruments: options.instruments } : {})}
    />,
  );
  const frame = () => ui.lastFrame() ?? '';
  /** Wait until the screen shows `text` (or the predicate holds). */
  const until = (what: string | RegExp | (() => boolean), timeout = 8000): Promise<string> =>
    waitForFrame(ui, typeof what === 'function' ? () => what() : what, timeout);
  /** Write keys one chunk at a time, each waiting for the frame it draws. */
  const press = async (...chunks: string[]) => {
    for (const c of chunks) await writeAndWait(ui, c);
  };
  /** Type text character by character. */
  const type = async (text: string) => press(...Array.from(text));
  const board = async (): Promise<BoardFile | null> => log.readBoard(serial);
  /** Type a reading, press Enter, and wait until the log has one more reading. */
  const read = async (text: string) => {
    const before = (await board())?.readings.length ?? 0;
    await type(text);
    await press(keys.enter);
    const start = Date.now();
    while (((await board())?.readings.length ?? 0) <= before) {
      if (Date.now() - start > 5000) throw new Error(`reading ${text} was not saved; screen:\n${frame()}`);
      await new Promise((r) => setTimeout(r, 10));
    }
    await until(() => !frame().includes('saving '));
  };
  return { ...ui, frame, until, press, type, read, board, exits, dirty, serial };
}

/** Acknowledge the cautions, then make the safety checks and rail readings pass: the screen stops at `osc.freq`. */
export async function powerUp(s: Pick<Awaited<ReturnType<typeof renderBringUp>>, 'until' | 'press' | 'read'>): Promise<void> {
  await s.until('Cautions before first power');
  await s.press(keys.enter);
  await s.until('rails.+9V.to-ground ›');
  for (const [value, next] of [
    ['OL', 'rails.-9V.to-ground'],
    ['22k', 'rails.idle-current'],
    ['12m', 'rails.+9V.dc'],
    ['9.02', 'rails.-9V.dc'],
    ['-8.97', 'osc.freq'],
  ] as const) {
    await s.read(value);
    await s.press(keys.enter);
    await s.until(`${next} ›`);
  }
}

export async function tempLog(): Promise<{ log: BenchLog; dir: string; cleanup: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), 'probebook-bringup-'));
  return { log: await openLog(dir), dir, cleanup: () => rm(dir, { recursive: true, force: true }) };
}

export async function boardJson(dir: string, serial: string): Promise<string> {
  return readFile(join(dir, 'boards', `${serial}.json`), 'utf8');
}

/**
 * The hooks every bring-up screen test file needs: the fixture loaded once
 * (read `suite.fixture` inside a test), and every temporary log and screen
 * removed after each test. `setup` makes a log and `open` draws a screen on it.
 */
export function bringUpSuite() {
  const cleanups: (() => Promise<void>)[] = [];
  const suite = {
    fixture: undefined as unknown as { plan: Plan; targets: TargetSet },
    /** Run `c` after the current test (before the next one starts). */
    onCleanup: (c: () => Promise<void>) => void cleanups.push(c),
    setup: async (options: ScreenOptions = {}) => {
      const tmp = await tempLog();
      cleanups.push(tmp.cleanup);
      return {
        tmp,
        open: async (o: ScreenOptions = options) => {
          const s = await renderBringUp(suite.fixture, tmp.log, o);
          cleanups.push(async () => s.unmount());
          return s;
        },
      };
    },
  };
  beforeAll(async () => {
    suite.fixture = await loadFixture();
  });
  afterEach(async () => {
    for (const c of cleanups.splice(0)) await c();
  });
  return suite;
}
