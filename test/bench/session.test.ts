import { afterAll, afterEach, describe, expect, test } from 'vitest';
import { InstrumentError } from '../../src/bench/errors.js';
import { parseInstruments } from '../../src/bench/instruments-file.js';
import { BenchSession } from '../../src/bench/session.js';
import { type Behaviour, closedPort, startTestInstrument, type TestInstrument } from '../helpers/scpi-instrument.js';

const idn = 'Invented Instruments,DMM-1,0001,1.0';
const started: TestInstrument[] = [];
const sessions: BenchSession[] = [];
afterEach(() => {
  for (const s of sessions.splice(0)) s.close();
});
afterAll(async () => {
  for (const i of started) await i.close();
});

async function bench(respond: (command: string) => Behaviour, extra: Record<string, unknown> = {}, timeout = '400 ms') {
  const inst = await startTestInstrument((c) => (c === '*IDN?' ? { kind: 'text', text: idn } : respond(c)));
  started.push(inst);
  const file = parseInstruments({ instruments: [{ name: 'dmm', address: `tcp://127.0.0.1:${inst.port}`, timeout, ...extra }] }, 'bench.json');
  const session = new BenchSession(file);
  sessions.push(session);
  return { inst, session, dmm: session.instrument('dmm') };
}

async function failure(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (error) {
    expect(error).toBeInstanceOf(InstrumentError);
    return (error as Error).message;
  }
  throw new Error('no failure');
}

describe('a bench session over real loopback TCP', () => {
  test('a reading: the unit query (SCPI MEASure default), the identity, the raw answer', async () => {
    const { inst, session, dmm } = await bench((c) => (c === 'MEAS:VOLT:DC?' ? { kind: 'text', text: '+1.19870000E+01' } : { kind: 'silent' }));
    const r = await session.readCheck(dmm, 'rails.+12V.dc', 'V');
    expect(r).toEqual({ value: 11.987, isOverload: false, raw: '+1.19870000E+01', query: 'MEAS:VOLT:DC?', instrument: { name: 'dmm', identity: idn } });
    expect(inst.received).toEqual(['*IDN?', 'MEAS:VOLT:DC?']);
    // One connection, reused; the identity asked once per session.
    await session.readCheck(dmm, 'rails.-12V.dc', 'V');
    expect(inst.connections).toBe(1);
    expect(inst.received.filter((c) => c === '*IDN?')).toHaveLength(1);
  });

  test('the check id wins over the unit; a scale turns a % answer into a fraction', async () => {
    const { session, dmm } = await bench((c) => (c === 'MEAS:DUTY?' ? { kind: 'text', text: '49.5' } : { kind: 'text', text: '1' }), {
      queries: { '1': 'MEAS:OTHER?', 'osc.duty': { query: 'MEAS:DUTY?', scale: 0.01 } },
    });
    const r = await session.readCheck(dmm, 'osc.duty', '1');
    expect(r.value).toBeCloseTo(0.495, 12); // 49.5 % as a fraction
    expect(r.query).toBe('MEAS:DUTY?');
  });

  test('9.9E37 is an overload (+∞), recorded like a typed OL', async () => {
    const { session, dmm } = await bench(() => ({ kind: 'text', text: '9.9E37' }));
    const r = await session.readCheck(dmm, 'rails.+12V.to-ground', 'Ω');
    expect(r.isOverload).toBe(true);
    expect(r.value).toBe(Infinity);
  });

  test('a slow answer inside the timeout is taken', async () => {
    const { session, dmm } = await bench(() => ({ kind: 'text', text: '2.417E3', delayMs: 150 }));
    expect((await session.readCheck(dmm, 'osc.freq', 'Hz')).value).toBe(2417);
  });

  test('silent: one timeout, a line naming the instrument, then a new connection for the next query', async () => {
    let silent = true;
    const { inst, session, dmm } = await bench(() => (silent ? { kind: 'silent' } : { kind: 'text', text: '5.0' }));
    const t0 = Date.now();
    const message = await failure(session.readCheck(dmm, 'x.v', 'V'));
    const spent = Date.now() - t0;
    expect(message).toMatch(/^instrument dmm: gave no answer to MEAS:VOLT:DC\? within 400 ms; nothing was recorded$/);
    // Bounded by the timeout (400 ms) plus scheduling slack; a hang would run into vitest's own timeout.
    expect(spent).toBeGreaterThanOrEqual(390);
    expect(spent).toBeLessThan(3000);
    silent = false;
    expect((await session.readCheck(dmm, 'x.v', 'V')).value).toBe(5);
    expect(inst.connections).toBe(2);
  });

  test('a slow answer past the timeout fails, and is never read as the next answer', async () => {
    let n = 0;
    const { session, dmm } = await bench((c) =>
      c === 'MEAS:VOLT:DC?' ? { kind: 'text', text: String(++n), delayMs: n === 0 ? 0 : n === 1 ? 700 : 0 } : { kind: 'silent' },
    );
    expect(await failure(session.readCheck(dmm, 'x.v', 'V'))).toMatch(/gave no answer/);
    const r = await session.readCheck(dmm, 'x.v', 'V');
    expect(r.value).toBe(2);
  });

  test('garbage, an SCPI error string, an out-of-range value: one line each', async () => {
    const answers: Record<string, string> = { 'MEAS:VOLT:DC?': 'hello there', 'MEAS:CURR:DC?': '-113,"Undefined header"', 'MEAS:FREQ?': '-5.0' };
    const { session, dmm } = await bench((c) => ({ kind: 'text', text: answers[c] ?? '' }));
    expect(await failure(session.readCheck(dmm, 'a.v', 'V'))).toMatch(/instrument dmm: answered "hello there", which is not a number to MEAS:VOLT:DC\?/);
    expect(await failure(session.readCheck(dmm, 'a.i', 'A'))).toMatch(/SCPI error -113 "Undefined header"/);
    expect(await failure(session.readCheck(dmm, 'a.f', 'Hz'))).toMatch(/out of range for a reading in Hz/);
  });

  test('a refused connection is one line, quickly', async () => {
    const port = await closedPort();
    const session = new BenchSession(parseInstruments({ instruments: [{ name: 'dead', address: `tcp://127.0.0.1:${port}`, timeout: '2 s' }] }, 'b.json'));
    sessions.push(session);
    expect(await failure(session.readCheck(session.instrument('dead'), 'a.v', 'V'))).toMatch(
      /^instrument dead: refused the connection at tcp:\/\/127\.0\.0\.1:\d+/,
    );
  });

  test('a reset, a close in mid-answer, a flood of bytes without a newline: no hang, no crash', async () => {
    const behaviours: Record<string, Behaviour> = {
      'MEAS:VOLT:DC?': { kind: 'reset' },
      'MEAS:CURR:DC?': { kind: 'close-mid', partial: '1.23' },
      'MEAS:FREQ?': { kind: 'flood', bytes: 2 * 1024 * 1024 },
    };
    const { session, dmm } = await bench((c) => behaviours[c] ?? { kind: 'silent' }, {}, '3 s');
    expect(await failure(session.readCheck(dmm, 'a.v', 'V'))).toMatch(/reset the connection|closed the connection/);
    expect(await failure(session.readCheck(dmm, 'a.i', 'A'))).toMatch(/closed the connection/);
    const before = process.memoryUsage().rss;
    expect(await failure(session.readCheck(dmm, 'a.f', 'Hz'))).toMatch(/more than 256 KiB without ending its answer/);
    // The flood is cut at the line cap (256 KiB), not buffered whole (2 MiB sent); RSS is a coarse guard.
    expect(process.memoryUsage().rss - before).toBeLessThan(64 * 1024 * 1024);
  });

  test('an unknown name lists the instruments the file has', async () => {
    const { session } = await bench(() => ({ kind: 'silent' }));
    expect(() => session.instrument('scope')).toThrow(/instrument scope: is not in bench\.json; its instruments are dmm/);
  });

  test('cancelling (Esc on the screen) ends the wait at once', async () => {
    const { session, dmm } = await bench(() => ({ kind: 'silent' }), {}, '10 s');
    const abort = new AbortController();
    setTimeout(() => abort.abort(), 100);
    const t0 = Date.now();
    expect(await failure(session.readCheck(dmm, 'a.v', 'V', abort.signal))).toMatch(/was cancelled/);
    expect(Date.now() - t0).toBeLessThan(2000); // well under the 10 s timeout
  });
});

describe('scope records over SCPI', () => {
  const capture = { data: 'WAV:DATA?', xincrement: 'WAV:XINC?', yscale: 'WAV:YINC?', yoffset: 'WAV:YOR?' };
  const scaling: Record<string, string> = { 'WAV:XINC?': '1.0E-6', 'WAV:YINC?': '0.02', 'WAV:YOR?': '10' };

  test('an int16 block is scaled: volts = (code − offset) · scale; the rate is 1/xincrement', async () => {
    const codes = Array.from({ length: 1000 }, (_, i) => Math.round(10 + 100 * Math.sin((2 * Math.PI * i) / 250)));
    const data = Buffer.alloc(codes.length * 2);
    for (const [i, c] of codes.entries()) data.writeInt16LE(c, 2 * i);
    const block = Buffer.concat([Buffer.from('#42000'), data, Buffer.from('\n')]);
    const { session, dmm } = await bench((c) => (c === 'WAV:DATA?' ? { kind: 'bytes', bytes: block } : { kind: 'text', text: scaling[c] ?? '' }), {
      capture: { ...capture, format: 'int16' },
    });
    const r = await session.capture(dmm);
    expect(r.sampleRate).toBeCloseTo(1e6, 6);
    expect(r.samples.length).toBe(1000);
    for (const [i, c] of codes.entries()) expect(r.samples[i]).toBeCloseTo((c - 10) * 0.02, 12);
  });

  test('an int8 block that arrives in pieces, and an ASCII list', async () => {
    const codes = Array.from({ length: 300 }, (_, i) => (i % 50) - 25);
    const data = Buffer.alloc(codes.length);
    for (const [i, c] of codes.entries()) data.writeInt8(c, i);
    const block = Buffer.concat([Buffer.from('#3300'), data, Buffer.from('\n')]);
    const { session, dmm } = await bench((c) => (c === 'WAV:DATA?' ? { kind: 'bytes', bytes: block } : { kind: 'text', text: scaling[c] ?? '' }), {
      capture: { ...capture, format: 'int8' },
    });
    const r = await session.capture(dmm);
    expect(Array.from(r.samples, (v) => Math.round(v / 0.02 + 10))).toEqual(codes);

    const list = codes.map((c) => (c * 0.1).toFixed(1)).join(',');
    const ascii = await bench((c) => (c === 'WAV:DATA?' ? { kind: 'text', text: list } : { kind: 'silent' }), {
      capture: { data: 'WAV:DATA?', format: 'ascii', xincrement: 2e-6 },
    });
    const a = await ascii.session.capture(ascii.dmm);
    expect(a.sampleRate).toBeCloseTo(5e5, 6);
    expect(a.samples[1]).toBeCloseTo(-2.4, 12); // (−24 · 0.1 − 0) · 1
  });

  test('a block shorter than its header says times out instead of hanging', async () => {
    const { session, dmm } = await bench(
      (c) => (c === 'WAV:DATA?' ? { kind: 'bytes', bytes: Buffer.from('#3100abc') } : { kind: 'text', text: scaling[c] ?? '' }),
      { capture: { ...capture, format: 'int8' } },
    );
    expect(await failure(session.capture(dmm))).toMatch(/gave no complete answer to WAV:DATA\?/);
  });
});
