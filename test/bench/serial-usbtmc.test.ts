import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { open } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { parseInstruments } from '../../src/bench/instruments-file.js';
import { BenchSession } from '../../src/bench/session.js';

// A pseudo-terminal pair made by socat (Debian package `socat`): the code under test opens
// one end as its serial port or USBTMC character device; the test answers on the other end.
const dir = mkdtempSync(join(tmpdir(), 'probebook-pty-'));
const procs: ChildProcess[] = [];

async function ptyPair(name: string): Promise<{ device: string; peer: string; stop: () => void }> {
  const device = join(dir, `${name}-dev`);
  const peer = join(dir, `${name}-peer`);
  const p = spawn('socat', [`pty,raw,echo=0,link=${device}`, `pty,raw,echo=0,link=${peer}`], { stdio: 'ignore' });
  procs.push(p);
  for (let i = 0; i < 100 && !(existsSync(device) && existsSync(peer)); i++) await new Promise((r) => setTimeout(r, 20));
  if (!existsSync(device)) throw new Error('socat did not make the pty pair (apt-get install socat)');
  // Ending socat first ends the blocking pty reads, so the file handles can close.
  return { device, peer, stop: () => p.kill() };
}

/** Answer every line arriving on the peer end with `respond(line)`. */
async function answerOn(peer: string, respond: (line: string) => string | null) {
  const handle = await open(peer, 'r+');
  let pending = '';
  const stream = handle.createReadStream();
  stream.on('data', (chunk) => {
    pending += chunk.toString();
    for (let end = pending.indexOf('\n'); end >= 0; end = pending.indexOf('\n')) {
      const line = pending.slice(0, end).trim();
      pending = pending.slice(end + 1);
      const reply = respond(line);
      if (reply !== null) void handle.write(`${reply}\n`);
    }
  });
  stream.on('error', () => undefined);
  return handle;
}

afterAll(() => {
  for (const p of procs) p.kill();
  rmSync(dir, { recursive: true, force: true });
});

describe('serial and USBTMC transports (over a pty pair)', () => {
  test('serial://DEVICE?baud=N: identity and a reading through the serialport package', async () => {
    const { device, peer, stop } = await ptyPair('serial');
    const handle = await answerOn(peer, (line) => (line === '*IDN?' ? 'Invented Counter,C-1,7,2.0' : line === 'MEAS:FREQ?' ? '+1.00230E+03' : null));
    const session = new BenchSession(
      parseInstruments({ instruments: [{ name: 'counter', address: `serial://${device}?baud=115200`, timeout: '2 s' }] }, 'b.json'),
    );
    try {
      const r = await session.readCheck(session.instrument('counter'), 'osc.freq', 'Hz');
      expect(r.value).toBeCloseTo(1002.3, 9);
      expect(r.instrument.identity).toBe('Invented Counter,C-1,7,2.0');
    } finally {
      session.close();
      stop();
      void handle.close().catch(() => undefined);
    }
  });

  test('usbtmc://DEVICE: write the query, read the answer from the character device', async () => {
    const { device, peer, stop } = await ptyPair('usbtmc');
    const handle = await answerOn(peer, (line) => (line === '*IDN?' ? 'Invented Meter,M-2,9,1.1' : line === 'MEAS:VOLT:DC?' ? '-1.19500E+01' : null));
    const session = new BenchSession(parseInstruments({ instruments: [{ name: 'meter', address: `usbtmc://${device}`, timeout: '2 s' }] }, 'b.json'));
    try {
      const r = await session.readCheck(session.instrument('meter'), 'rails.-12V.dc', 'V');
      expect(r.value).toBeCloseTo(-11.95, 9);
      expect(r.instrument.identity).toBe('Invented Meter,M-2,9,1.1');
    } finally {
      session.close();
      stop();
      void handle.close().catch(() => undefined);
    }
  });

  test('a missing device is one line', async () => {
    const session = new BenchSession(
      parseInstruments(
        {
          instruments: [
            { name: 'meter', address: `usbtmc://${join(dir, 'none')}`, timeout: '1 s' },
            { name: 'port', address: `serial://${join(dir, 'none')}`, timeout: '1 s' },
          ],
        },
        'b.json',
      ),
    );
    await expect(session.readCheck(session.instrument('meter'), 'a.v', 'V')).rejects.toThrow(/^instrument meter: has no device at usbtmc:\/\//);
    await expect(session.readCheck(session.instrument('port'), 'a.v', 'V')).rejects.toThrow(/^instrument port: /);
    session.close();
  });
});
