import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, test } from 'vitest';
import { openLog } from '../../src/log/store.js';
import { closedPort, startTestInstrument, type TestInstrument } from '../helpers/scpi-instrument.js';
import { biasPlan, cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

const t = tempDir('record-from');
const servers: TestInstrument[] = [];
afterAll(async () => {
  for (const s of servers) await s.close();
  t.remove();
});
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'ines' };
const idn = 'Invented Instruments,DMM-9,42,3.1';

async function benchFile(name: string, answers: Record<string, string | null>, extra: Record<string, unknown> = {}): Promise<string> {
  const inst = await startTestInstrument((c) => {
    const a = c === '*IDN?' ? idn : answers[c];
    return a === undefined || a === null ? { kind: 'silent' } : { kind: 'text', text: a };
  });
  servers.push(inst);
  const file = join(t.dir, `${name}.json`);
  writeFileSync(file, JSON.stringify({ instruments: [{ name: 'dmm', address: `tcp://127.0.0.1:${inst.port}`, timeout: '500 ms', ...extra }] }));
  return file;
}

const record = (board: string, file: string, extra: string[] = []) =>
  cli(['record', '--plan', biasPlan, '--board', board, '--check', 'ref.out.dc', '--from', 'dmm', '--instruments', file, ...extra], env);

const bin = fileURLToPath(new URL('../../src/cli/bin.ts', import.meta.url));

/**
 * `probebook instruments --simulate PLAN` from the sources on a free loopback port,
 * writing its instruments file to `file`; resolves once it says it serves (its
 * Ctrl-C line). The caller stops it with `child.kill()`.
 */
async function startSimulator(plan: string, file: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', bin, 'instruments', '--simulate', plan, '--port', '0', '--write', file, '--seed', '7'], {
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  try {
    await new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`simulator did not start: ${out}`)), 20_000);
      child.stdout.on('data', (c) => {
        out += c.toString();
        if (out.includes('Ctrl-C')) {
          clearTimeout(timer);
          resolve();
        }
      });
      child.on('exit', () => reject(new Error(`simulator exited: ${out}`)));
    });
  } catch (error) {
    child.kill('SIGTERM');
    throw error;
  }
  return child;
}

describe('record --from (DESIGN §7a)', () => {
  test('the instrument answer is recorded like a typed reading, with its raw text and the instrument', async () => {
    const file = await benchFile('ok', { 'MEAS:VOLT:DC?': '+3.27100000E+00' });
    const r = await record('F-001', file, ['--json']);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.reading).toMatchObject({
      check: 'ref.out.dc',
      value: 3.271,
      unit: 'V',
      raw: '+3.27100000E+00',
      operator: 'ines',
      instrument: { name: 'dmm', identity: idn },
    });
    // 3.271 V lies inside the divider's band (10 V · 3k3/(6k8+3k3) = 3.267 V nominal, any circuits handbook).
    expect(out.verdict).toBe('pass');
    const board = await (await openLog(t.dir)).readBoard('F-001');
    expect(board?.readings[0]).toMatchObject({ value: 3.271, raw: '+3.27100000E+00', instrument: { name: 'dmm', identity: idn } });
  });

  test('readable output names the instrument and its answer', async () => {
    const file = await benchFile('text', { 'MEAS:VOLT:DC?': '3.30' });
    const r = await record('F-002', file);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toContain('ref.out.dc = 3.3 V  (from dmm, answered "3.30")');
  });

  test('an overload (9.9E37) is recorded as OL and fails the check', async () => {
    const file = await benchFile('ol', { 'MEAS:VOLT:DC?': '9.9E37' });
    const r = await record('F-003', file, ['--json']);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.reading.value).toBeNull();
    expect(out.reading.raw).toMatch(/^OL/);
    expect(out.verdict).toBe('fail');
  });

  test.each([
    ['silent', { 'MEAS:VOLT:DC?': null }, /instrument dmm: gave no answer to MEAS:VOLT:DC\? within 500 ms; nothing was recorded/],
    ['garbage', { 'MEAS:VOLT:DC?': 'READY' }, /instrument dmm: answered "READY", which is not a number/],
    ['scpi error', { 'MEAS:VOLT:DC?': '-222,"Data out of range"' }, /SCPI error -222/],
    ['out of range', { 'MEAS:VOLT:DC?': '1.0E+6' }, /out of range for a reading in V/],
  ] as const)('%s: one line, exit 1, no board file written', async (name, answers, message) => {
    const file = await benchFile(name.replace(/ /g, '-'), answers);
    const board = `BAD-${name.replace(/ /g, '-')}`;
    const r = await record(board, file);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(existsSync(join(t.dir, 'boards', `${board}.json`))).toBe(false);
  });

  test('a refused connection: exit 1, nothing recorded', async () => {
    const port = await closedPort();
    const file = join(t.dir, 'dead.json');
    writeFileSync(file, JSON.stringify({ instruments: [{ name: 'dmm', address: `tcp://127.0.0.1:${port}` }] }));
    const r = await record('BAD-refused', file);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^probebook: instrument dmm: refused the connection/);
    expect(existsSync(join(t.dir, 'boards', 'BAD-refused.json'))).toBe(false);
  });

  test('bad arguments and a bad file exit 2', async () => {
    const file = await benchFile('args', { 'MEAS:VOLT:DC?': '3.3' });
    const both = await cli(
      ['record', '--plan', biasPlan, '--board', 'X-1', '--check', 'ref.out.dc', '--from', 'dmm', '--value', '3.3', '--instruments', file],
      env,
    );
    expect(both.status).toBe(2);
    expect(both.stderr).toMatch(/--value or --from, not both/);
    const unknown = await cli(['record', '--plan', biasPlan, '--board', 'X-1', '--check', 'ref.out.dc', '--from', 'scope', '--instruments', file], env);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toMatch(/no such instrument .* it has dmm/);
    const broken = join(t.dir, 'broken.json');
    writeFileSync(broken, JSON.stringify({ instruments: [{ name: 'dmm', address: 'dmm:5025' }] }));
    const bad = await cli(['record', '--plan', biasPlan, '--board', 'X-1', '--check', 'ref.out.dc', '--from', 'dmm', '--instruments', broken], env);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/instruments .*broken\.json, instruments\[0\]\.address/);
    expect(existsSync(join(t.dir, 'boards', 'X-1.json'))).toBe(false);
  });
});

describe('probebook instruments', () => {
  test('--json: each instrument with its identity or its error, asked in parallel', async () => {
    const live = await startTestInstrument((c) => (c === '*IDN?' ? { kind: 'text', text: idn } : { kind: 'silent' }));
    const silent = await startTestInstrument(() => ({ kind: 'silent' }));
    servers.push(live, silent);
    const port = await closedPort();
    const file = join(t.dir, 'three.json');
    writeFileSync(
      file,
      JSON.stringify({
        instruments: [
          { name: 'dmm', address: `tcp://127.0.0.1:${live.port}` },
          { name: 'scope', address: `tcp://127.0.0.1:${silent.port}`, timeout: '800 ms' },
          { name: 'gone', address: `tcp://127.0.0.1:${port}` },
        ],
      }),
    );
    const t0 = Date.now();
    const r = await cli(['instruments', '--instruments', file, '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    // In parallel: the whole call costs about the longest timeout (0.8 s), not their sum.
    expect(Date.now() - t0).toBeLessThan(2500);
    const out = JSON.parse(r.stdout);
    expect(out.instruments).toEqual([
      { name: 'dmm', address: `tcp://127.0.0.1:${live.port}`, identity: idn, error: null },
      { name: 'scope', address: `tcp://127.0.0.1:${silent.port}`, identity: null, error: 'gave no answer to *IDN? within 800 ms' },
      { name: 'gone', address: `tcp://127.0.0.1:${port}`, identity: null, error: expect.stringMatching(/^refused the connection/) },
    ]);
  });

  test('--help explains the file and the simulated bench', async () => {
    const r = await cli(['instruments', '--help'], env);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('--simulate PLAN');
    expect(r.stdout).toContain('tcp://HOST[:PORT]');
  });
});

describe('the simulated bench (instruments --simulate)', () => {
  test('serves a plan: record --from reads a value inside the check band', async () => {
    const file = join(t.dir, 'sim.json');
    const child = await startSimulator(biasPlan, file);
    try {
      const r = await cli(
        ['record', '--plan', biasPlan, '--board', 'SIM-1', '--check', 'ref.out.dc', '--from', 'sim-meter', '--instruments', file, '--json'],
        env,
      );
      expect(r.status, r.stderr).toBe(0);
      const got = JSON.parse(r.stdout);
      expect(got.reading.instrument.identity).toMatch(/simulated bench/);
      expect(got.reading.value).toBeGreaterThanOrEqual(got.worst.min);
      expect(got.reading.value).toBeLessThanOrEqual(got.worst.max);
      const list = await cli(['instruments', '--instruments', file, '--json'], env);
      expect(JSON.parse(list.stdout).instruments.map((i: { error: unknown }) => i.error)).toEqual([null]);
    } finally {
      child.kill('SIGTERM');
    }
  }, 30_000);
});

describe('the simulated scope', () => {
  test("a record of the exciter demo's last waveform arrives as an int8 block at the oscillator frequency", async () => {
    const { loadInstruments } = await import('../../src/bench/instruments-file.js');
    const { BenchSession } = await import('../../src/bench/session.js');
    const { measure } = await import('../../src/signal/measure.js');
    const plan = fileURLToPath(new URL('../../demo/exciter.plan.json', import.meta.url));
    const file = join(t.dir, 'sim-scope.json');
    const child = await startSimulator(plan, file);
    try {
      const session = new BenchSession(await loadInstruments(file));
      try {
        const rec = await session.capture(session.instrument('sim-scope'));
        const m = measure(rec.samples, rec.sampleRate).measurements;
        const freq = JSON.parse((await cli(['targets', plan, '--json'], env)).stdout).targets.find((x: { check: string }) => x.check === 'osc.freq');
        // Three periods of the nominal waveform: its frequency is the oscillator's nominal (within 1 %, the crossing estimate over 3 periods).
        expect(Math.abs((m.frequency ?? 0) / freq.nominal - 1)).toBeLessThan(0.01);
      } finally {
        session.close();
      }
    } finally {
      child.kill('SIGTERM');
    }
  }, 60_000);
});

describe('record --from a scope (a capture figure measured from an SCPI record)', () => {
  test('a sine record answers a vpp check: measured, recorded, and the record kept with the reading', async () => {
    const plan = fileURLToPath(new URL('../../demo/line-driver.plan.json', import.meta.url));
    // An invented 2 kHz sine of 1.25 V peak, 4,000 int16 codes at 1 MS/s (50 µV a code).
    const n = 4000;
    const codes = Buffer.alloc(2 * n);
    for (let i = 0; i < n; i++) codes.writeInt16LE(Math.round((1.25 * Math.sin((2 * Math.PI * 2000 * i) / 1e6)) / 50e-6), 2 * i);
    const block = Buffer.concat([Buffer.from(`#4${codes.length}`), codes, Buffer.from('\n')]);
    const scope = await startTestInstrument((c) =>
      c === '*IDN?'
        ? { kind: 'text', text: 'Invented Scopes,S-1,5,0.9' }
        : c === 'WAV:DATA?'
          ? { kind: 'bytes', bytes: block }
          : { kind: 'text', text: ({ 'WAV:XINC?': '1E-6', 'WAV:YINC?': '5E-5', 'WAV:YOR?': '0' } as Record<string, string>)[c] ?? '-113,"Undefined header"' },
    );
    servers.push(scope);
    const file = join(t.dir, 'scope.json');
    writeFileSync(
      file,
      JSON.stringify({
        instruments: [
          {
            name: 'scope',
            address: `tcp://127.0.0.1:${scope.port}`,
            capture: { data: 'WAV:DATA?', format: 'int16', xincrement: 'WAV:XINC?', yscale: 'WAV:YINC?', yoffset: 'WAV:YOR?' },
          },
        ],
      }),
    );
    const r = await cli(['record', '--plan', plan, '--board', 'SC-1', '--check', 'filt.out.vpp', '--from', 'scope', '--instruments', file, '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    // A sine's peak-to-peak is twice its peak (any signals handbook): 2.5 V, within 0.5 % (quantisation and sampling).
    expect(Math.abs(out.reading.value / 2.5 - 1)).toBeLessThan(0.005);
    expect(out.reading.raw).toMatch(/^vpp .* from scope's record$/);
    const board = await (await openLog(t.dir)).readBoard('SC-1');
    const saved = board?.readings[0];
    expect(saved?.capture).toMatch(/^[0-9a-f]{64}\.csv$/);
    expect(board?.captures).toEqual([expect.objectContaining({ file: saved?.capture, check: 'filt.out.vpp', name: 'scope-filt.out.vpp.csv' })]);
    // The kept record reads back as a capture: analyze gives the same peak-to-peak.
    const analyzed = await cli(['analyze', join(t.dir, 'captures', saved?.capture ?? ''), '--json'], env);
    expect(JSON.parse(analyzed.stdout).vpp).toBeCloseTo(out.reading.value, 6);
  });
});
