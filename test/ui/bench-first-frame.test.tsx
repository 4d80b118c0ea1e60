import { readFile, writeFile } from 'node:fs/promises';
import { render } from 'ink-testing-library';
import { afterEach, describe, expect, test } from 'vitest';
import { type LogStore, openLog } from '../../src/log/store.js';
import type { BoardFile } from '../../src/log/types.js';
import { loadPlanText } from '../../src/plan/load.js';
import type { Plan } from '../../src/plan/types.js';
import { App } from '../../src/ui/app.js';
import { PlanCatalog } from '../../src/ui/bench/plan-catalog.js';
import { tempDir } from '../log/fixtures/temp-log.js';
import { keys } from './keys.js';
import { fixturePlanText, seedBoard } from './render-app.js';
import { waitForFrame, writeAndWait } from './wait-frame.js';

// The bench screen's first frame (issue 15): it lists the boards the index keeps
// at its top before the whole index is read, and needs no plan to do so; the plans
// may arrive later (the TUI loads them after that frame).

let cleanup: (() => void)[] = [];
afterEach(() => {
  for (const c of cleanup) c();
  cleanup = [];
});

const rail = (value: number) => ({ check: 'rails.+12V.dc', value, unit: 'V' as const, raw: value.toFixed(2), verdict: 'pass' as const });

/** A log of three boards (FX-0003 the latest) with its index written, and the fixture plan. */
async function threeBoardLog(): Promise<{ log: LogStore; plan: Plan }> {
  const t = tempDir('first-frame');
  cleanup.push(t.remove);
  const log = await openLog(t.dir);
  const plan = loadPlanText(fixturePlanText, 'fixture.plan.json');
  for (const serial of ['FX-0001', 'FX-0002', 'FX-0003']) await seedBoard(log, plan, serial, [rail(12)], 'passed');
  await log.readIndex();
  return { log, plan };
}

/** The log with `readIndex` held until `release()`: the whole index arrives when the test says. */
function held(log: LogStore) {
  let release!: () => void;
  const gate = new Promise<void>((resolve) => {
    release = resolve;
  });
  const proxy = new Proxy(log, {
    get(target, name) {
      if (name === 'readIndex')
        return async (...args: Parameters<LogStore['readIndex']>) => {
          await gate;
          return target.readIndex(...args);
        };
      const value = Reflect.get(target, name, target) as unknown;
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
  return { log: proxy, release };
}

const catalogOf = (log: LogStore, plan: Plan) => new PlanCatalog(log, [plan], { trials: 400, seed: 1, offThread: false });

describe('the bench screen’s first frame', () => {
  test('lists the boards at the top of the index before the whole index is read; the selection is kept when it arrives', async () => {
    const { log, plan } = await threeBoardLog();
    // A board copied in by hand (no journal line): only the whole index, which looks at the files, knows it.
    const copied = JSON.parse(await readFile(log.boardPath('FX-0001'), 'utf8')) as BoardFile;
    const later = new Date(Date.now() + 3_600_000).toISOString();
    const board: BoardFile = { ...copied, serial: 'FX-HAND', runs: copied.runs.map((r) => ({ ...r, id: 'hand-run', started: later, ended: later })) };
    await writeFile(log.boardPath('FX-HAND'), `${JSON.stringify(board)}\n`);

    const { log: slow, release } = held(log);
    const ui = render(<App log={slow} catalog={catalogOf(log, plan)} operator="tester" size={{ width: 80, height: 23 }} onQuit={() => {}} />);
    try {
      let frame = ui.lastFrame() ?? '';
      expect(frame).toContain('probebook · bench · reading the log…');
      expect(frame).toMatch(/› FX-0003[\s\S]*FX-0002[\s\S]*FX-0001/);
      expect(frame).not.toContain('FX-HAND');
      expect(frame).not.toContain('Reading the log index'); // rows instead of the loading line
      expect(frame).toContain('? help');
      frame = await writeAndWait(ui, 'j', /› FX-0002/);

      release();
      frame = await waitForFrame(ui, 'FX-HAND');
      expect(frame).toContain('probebook · bench · 4 boards');
      // FX-HAND is listed first now; the technician's board stays selected.
      expect(frame).toMatch(/FX-HAND[\s\S]*› FX-0002/);
    } finally {
      release();
      ui.unmount();
    }
  });

  test('a serial typed before the whole index is read is looked up in the whole index, not taken for a new board', async () => {
    const { log, plan } = await threeBoardLog();
    const { log: slow, release } = held(log);
    const ui = render(<App log={slow} catalog={catalogOf(log, plan)} operator="tester" size={{ width: 80, height: 23 }} onQuit={() => {}} />);
    try {
      await writeAndWait(ui, 'n', 'New board');
      for (const ch of 'FX-0001') await writeAndWait(ui, ch);
      await writeAndWait(ui, keys.enter, 'reading the log index…');
      release();
      const frame = await waitForFrame(ui, 'FX-0001 is already in the log');
      expect(frame).toMatch(/› FX-0001/);
      expect(await log.readBoard('FX-0001')).toMatchObject({ runs: [{ outcome: 'passed' }] }); // no new run was started
    } finally {
      release();
      ui.unmount();
    }
  });

  test('a serial that is a name of every JavaScript object is still a new board', async () => {
    const { log, plan } = await threeBoardLog();
    const ui = render(<App log={log} catalog={catalogOf(log, plan)} operator="tester" size={{ width: 80, height: 23 }} onQuit={() => {}} />);
    try {
      await waitForFrame(ui, '3 boards');
      await writeAndWait(ui, 'n', 'New board');
      for (const ch of 'constructor') await writeAndWait(ui, ch);
      const frame = await writeAndWait(ui, keys.enter, 'Cautions before first power');
      expect(frame).toContain('constructor');
    } finally {
      ui.unmount();
    }
  });

  test('the plans may arrive after the first frame: screens that need them wait for them, a failure is said', async () => {
    const { log, plan } = await threeBoardLog();
    let resolve!: (c: PlanCatalog) => void;
    const later = new Promise<PlanCatalog>((r) => {
      resolve = r;
    });
    const ui = render(<App log={log} catalog={later} operator="tester" size={{ width: 80, height: 23 }} onQuit={() => {}} />);
    try {
      await waitForFrame(ui, 'probebook · bench · 3 boards');
      await writeAndWait(ui, 'h', 'loading the plans…');
      resolve(catalogOf(log, plan));
      await waitForFrame(ui, 'probebook · history · FX-0003');
    } finally {
      ui.unmount();
    }

    const failed = Promise.reject(new Error('plan bad.plan.json, stages[0].parts.R1: "10q" is not a resistance'));
    const ui2 = render(<App log={log} catalog={failed} operator="tester" size={{ width: 80, height: 23 }} onQuit={() => {}} />);
    try {
      await waitForFrame(ui2, '3 boards');
      await writeAndWait(ui2, 'b', /✗ plan bad\.plan\.json, stages\[0\]\.parts\.R1/);
      await writeAndWait(ui2, keys.escape, '3 boards');
      // Enter on a board needs its plan: the failure is said on the bench screen.
      const frame = await writeAndWait(ui2, keys.enter, /✗ plan bad\.plan\.json/);
      expect(frame).toContain('FX-0003');
    } finally {
      ui2.unmount();
    }
  });
});
