import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { openLog } from '../../src/log/store.js';
import type { BenchLog, Reading } from '../../src/log/types.js';
import { loadPlanText } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { App, type Route } from '../../src/ui/app.js';
import { PlanCatalog } from '../../src/ui/bench/plan-catalog.js';
import type { PlanEditAccess } from '../../src/ui/plan-editor/plan-edit-access.js';
import { type Expectation, waitForFrame, writeAndWait } from './wait-frame.js';

/**
 * A small invented board for the UI tests: a relaxation oscillator on ±12 V
 * rails feeding an inverting stage. Values are illustrative, not from any product.
 */
export const fixturePlan = {
  plan: 'ui-fixture',
  title: 'UI test board (invented)',
  note: 'Invented test board; values are illustrative, not from any product.',
  rails: [
    { id: '+12V', nominal: '12 V', tol: '3%' },
    { id: '-12V', nominal: '-12 V', tol: '3%' },
  ],
  idleCurrent: { max: '30 mA' },
  uncertainty: { V: '0.5% + 2 mV', A: '1% + 0.1 mA', Hz: '0.01%', ohm: '1% + 1 ohm' },
  stages: [
    {
      id: 'osc',
      kind: 'schmitt-integrator',
      parts: { R1: '10k 1%', R2: '22k 1%', Rt: '4k7 1%', Ct: '47n 5%' },
      testPoints: { square: 'TP1', triangle: 'TP2' },
    },
    { id: 'amp', kind: 'inverting-amp', input: 'osc.triangle', parts: { Rin: '10k 1%', Rf: '15k 1%' }, testPoints: { out: 'TP3' } },
  ],
};
export const fixturePlanText = `${JSON.stringify(fixturePlan, null, 2)}\n`;

/** One reading for `seedBoard`, as a technician would have typed it. */
export interface SeedReading {
  readonly check: string;
  readonly value: number;
  readonly unit: Reading['unit'];
  readonly raw: string;
  readonly verdict: Reading['verdict'];
}

/** A board with one run of readings, written through the real store; ended when `outcome` is given. */
export async function seedBoard(log: BenchLog, plan: Plan, serial: string, readings: readonly SeedReading[], outcome?: 'passed' | 'failed') {
  const run = await log.startRun(serial, { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator: 'earlier' });
  for (const r of readings) await log.appendReading(serial, { ...r, run: run.id, operator: 'earlier', planHash: plan.hash });
  if (outcome) await log.endRun(serial, run.id, outcome);
  return run;
}

export interface RenderAppOptions {
  /** Plan texts given as if with `--plan`. @default [fixturePlanText] */
  readonly planTexts?: readonly string[];
  /** Put boards into the log before the app starts. */
  readonly setup?: (log: BenchLog, plans: readonly Plan[]) => Promise<void>;
  /** @default 80 */
  readonly width?: number;
  /** @default 23 (a 24-row terminal less the row Ink needs) */
  readonly height?: number;
  /** Monte Carlo trials for the targets; small keeps the tests fast. @default 400 */
  readonly trials?: number;
  readonly operator?: string;
  readonly initialRoute?: Route;
  /** Follow the (fake) terminal's size instead of a fixed one, for resize tests. @default false */
  readonly followTerminal?: boolean;
  /** How the plan screen's `e` opens and saves a plan (the CLI's `planEditAccess` on a folder). @default none: no `e` */
  readonly planEditing?: PlanEditAccess;
}

/** The app on a fresh temporary log, as ink-testing-library renders it, plus the log and its folder. */
export async function renderApp(options: RenderAppOptions = {}) {
  const dir = await mkdtemp(join(tmpdir(), 'probebook-ui-'));
  const log = await openLog(dir);
  const plans = (options.planTexts ?? [fixturePlanText]).map((text, i) => loadPlanText(text, `fixture-${i}.plan.json`));
  await options.setup?.(log, plans);
  // On this thread: a worker under tsx takes a second to start, and the worker has its own test.
  const catalog = new PlanCatalog(log, plans, { trials: options.trials ?? 400, seed: 1, offThread: false });
  let quits = 0;
  const result = render(
    <App
      log={log}
      catalog={catalog}
      operator={options.operator ?? 'tester'}
      onQuit={() => void quits++}
      {...(options.followTerminal ? {} : { size: { width: options.width ?? 80, height: options.height ?? 23 } })}
      {...(options.initialRoute ? { initialRoute: options.initialRoute } : {})}
      {...(options.planEditing ? { planEditing: options.planEditing } : {})}
    />,
  );
  const frame = () => result.lastFrame() ?? '';
  /** Wait until the screen shows `text` (or the predicate holds); fails with the last frame. */
  const waitFor = (text: Expectation, timeoutMs = 8000) => waitForFrame(result, text, timeoutMs);
  /** Send keys, each waiting for the frame it draws (a key that changes nothing draws none: a bounded wait). */
  const press = async (...sequence: string[]) => {
    for (const key of sequence) await writeAndWait(result, key);
  };
  /** Type text one key at a time, as a technician does. */
  const type = async (text: string) => press(...[...text]);
  const cleanup = async () => {
    result.unmount();
    await rm(dir, { recursive: true, force: true });
  };
  /** How often the technician asked to quit (the app's exit is replaced by a counter). */
  const quitCount = () => quits;
  return { ...result, dir, log, plans, catalog, frame, waitFor, press, type, cleanup, quitCount };
}

export type RenderedApp = Awaited<ReturnType<typeof renderApp>>;
