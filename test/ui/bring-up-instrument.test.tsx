import { afterAll, afterEach, beforeAll, describe, expect, test } from 'vitest';
import { parseInstruments } from '../../src/bench/instruments-file.js';
import { BenchSession } from '../../src/bench/session.js';
import { sessionSource } from '../../src/bench/source.js';
import { startTestInstrument, type TestInstrument } from '../helpers/scpi-instrument.js';
import { loadFixture, renderBringUp, tempLog } from './bring-up-harness.js';
import { keys } from './keys.js';

// The bring-up screen's instrument keys against an in-test SCPI instrument on a real loopback socket.
let fixture: Awaited<ReturnType<typeof loadFixture>>;
const servers: TestInstrument[] = [];
const cleanups: (() => Promise<void> | void)[] = [];
beforeAll(async () => {
  fixture = await loadFixture();
});
afterEach(async () => {
  for (const c of cleanups.splice(0)) await c();
});
afterAll(async () => {
  for (const s of servers) await s.close();
});

async function setup(answer: (command: string) => string | null, delayMs = 0) {
  let n = 0;
  const inst = await startTestInstrument((c) => {
    if (c === '*IDN?') return { kind: 'text', text: 'Invented Instruments,DMM-3,1,1.0' };
    const a = answer(c);
    n++;
    return a === null ? { kind: 'silent' } : { kind: 'text', text: a, delayMs };
  });
  servers.push(inst);
  const file = parseInstruments(
    { instruments: [{ name: 'dmm', address: `tcp://127.0.0.1:${inst.port}`, timeout: '5 s', queries: { ohm: 'MEAS:RES?', V: 'MEAS:VOLT:DC?' } }] },
    'bench.json',
  );
  const source = sessionSource(file, new BenchSession(file));
  const t = await tempLog();
  cleanups.push(() => source.close(), t.cleanup);
  const s = await renderBringUp(fixture, t.log, { instruments: source });
  cleanups.push(() => s.unmount());
  await s.until(/first power|Enter/);
  await s.press(keys.enter);
  return { s, inst, count: () => n };
}

describe('bring-up: readings from a bench instrument', () => {
  test('the input line says which instrument and query; m records its answer with the instrument named', async () => {
    const { s } = await setup((c) => (c === 'MEAS:RES?' ? '+1.20000E+04' : null), 300);
    await s.until('m reads dmm (MEAS:RES?)');
    await s.press('m');
    // The wait is shown with its time while the instrument answers (300 ms).
    await s.until(/reading dmm \(MEAS:RES\?\)… \d+\.\d s · Esc cancels/);
    await s.until(() => s.frame().includes('saved') || s.frame().includes('PASS') || s.frame().includes('pass'));
    const board = await s.board();
    expect(board?.readings[0]).toMatchObject({
      check: 'rails.+9V.to-ground',
      value: 12000,
      raw: '+1.20000E+04',
      instrument: { name: 'dmm', identity: 'Invented Instruments,DMM-3,1,1.0' },
      verdict: 'pass',
    });
  });

  test('Esc cancels a silent instrument at once; nothing is recorded and the screen goes on', async () => {
    const { s } = await setup(() => null);
    await s.press('m');
    await s.until(/reading dmm/);
    const t0 = Date.now();
    await s.press(keys.escape);
    await s.until(/not recorded: instrument dmm: was cancelled/);
    expect(Date.now() - t0).toBeLessThan(3000); // well under the instrument's 5 s timeout
    expect((await s.board())?.readings ?? []).toHaveLength(0);
    // Typing works again.
    await s.read('15k');
    expect((await s.board())?.readings).toHaveLength(1);
  });

  test('M takes five readings and records their mean, the values kept in the raw text', async () => {
    const values = ['11900', '12000', '12100', '12050', '11950'];
    let i = 0;
    const { s, count } = await setup((c) => (c === 'MEAS:RES?' ? (values[i++ % values.length] ?? '0') : null));
    await s.press('M');
    await s.until(() => count() >= 5);
    const start = Date.now();
    while (!(await s.board())?.readings.length && Date.now() - start < 5000) await new Promise((r) => setTimeout(r, 20));
    const r = (await s.board())?.readings[0];
    // Mean of the five (hand sum: 60000 / 5).
    expect(r?.value).toBe(12000);
    expect(r?.raw).toBe('mean of 5: 11900, 12000, 12100, 12050, 11950');
  });

  test('no instruments file: m says how to set one up', async () => {
    const t = await tempLog();
    cleanups.push(t.cleanup);
    const s = await renderBringUp(fixture, t.log);
    cleanups.push(() => s.unmount());
    await s.until(/Enter/);
    await s.press(keys.enter, 'm');
    await s.until(/no instruments file: see probebook instruments --help/);
  });
});
