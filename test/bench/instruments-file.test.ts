import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { InstrumentsFileError } from '../../src/bench/errors.js';
import { defaultQueries, instrumentsPath, loadInstruments, parseInstruments, queryFor } from '../../src/bench/instruments-file.js';

const dir = mkdtempSync(join(tmpdir(), 'probebook-instruments-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const problem = (json: unknown) => {
  try {
    parseInstruments(json, 'bench.json');
  } catch (error) {
    expect(error).toBeInstanceOf(InstrumentsFileError);
    return (error as Error).message;
  }
  throw new Error('accepted');
};

describe('the instruments file (DESIGN §7a)', () => {
  test('the example of the design loads: timeout, queries by unit and by check id, ohm as Ω', () => {
    const f = parseInstruments(
      {
        instruments: [
          { name: 'dmm', address: 'tcp://192.0.2.10:5025', timeout: '3 s', queries: { V: 'MEAS:VOLT:DC?', A: 'MEAS:CURR:DC?', ohm: 'MEAS:RES?' } },
          { name: 'counter', address: 'serial:///dev/ttyUSB0?baud=9600', queries: { Hz: 'MEAS:FREQ?', 'osc.duty': { query: 'MEAS:DUTY?', scale: 0.01 } } },
        ],
      },
      'bench.json',
    );
    const [dmm, counter] = f.instruments;
    expect(dmm?.timeout).toBe(3000);
    expect(queryFor(dmm!, 'rails.+12V.to-ground', 'Ω')?.query).toBe('MEAS:RES?');
    expect(queryFor(counter!, 'osc.duty', '1')).toEqual({ query: 'MEAS:DUTY?', scale: 0.01 });
    expect(queryFor(counter!, 'osc.freq', 'Hz')?.query).toBe('MEAS:FREQ?');
    expect(queryFor(counter!, 'gain.out.vpp', 'V')).toBeUndefined();
  });

  test('no queries: the SCPI MEASure defaults; no timeout: 3 s', () => {
    const f = parseInstruments({ instruments: [{ name: 'm', address: 'tcp://127.0.0.1' }] }, 'b.json');
    expect(f.instruments[0]?.queries).toBe(defaultQueries);
    expect(f.instruments[0]?.timeout).toBe(3000);
    expect(queryFor(f.instruments[0]!, 'x.y', 'Hz')?.query).toBe('MEAS:FREQ?');
  });

  test('mistakes name the file and the JSON path', () => {
    expect(problem({ instruments: [{ name: 'dmm', address: 'dmm.local' }] })).toMatch(/^instruments bench\.json, instruments\[0\]\.address: .*tcp:\/\//);
    expect(problem({ instruments: [{ name: 'dmm', address: 'tcp://h', timeout: 'soon' }] })).toMatch(/instruments\[0\]\.timeout/);
    expect(
      problem({
        instruments: [
          { name: 'a', address: 'tcp://h' },
          { name: 'a', address: 'tcp://h' },
        ],
      }),
    ).toMatch(/instruments\[1\]\.name: "a" is named twice/);
    expect(problem({ instruments: [{ name: 'a', address: 'tcp://h', queries: { volts: 'X?' } }] })).toMatch(/queries\.volts/);
    expect(problem({ instruments: [{ name: 'a', address: 'tcp://h', queries: { V: 'MEAS?\n*RST' } }] })).toMatch(/one line/);
    expect(problem({ instruments: [{ name: 'a', address: 'tcp://h', colour: 'red' }] })).toMatch(/instruments\[0\]/);
    expect(problem({ instruments: [{ name: 'a', address: 'tcp://h', capture: { data: 'WAV:DATA?', format: 'float', xincrement: 1e-6 } }] })).toMatch(
      /capture\.format/,
    );
    expect(problem({ devices: [] })).toMatch(/^instruments bench\.json/);
  });

  test('where the file is: flag, then PROBEBOOK_INSTRUMENTS, then an absolute XDG_CONFIG_HOME (XDG Base Directory Specification)', () => {
    expect(instrumentsPath('b.json', {}, '/w')).toBe('/w/b.json');
    expect(instrumentsPath(undefined, { PROBEBOOK_INSTRUMENTS: '/etc/bench.json' }, '/w')).toBe('/etc/bench.json');
    expect(instrumentsPath(undefined, { XDG_CONFIG_HOME: '/cfg' }, '/w')).toBe('/cfg/probebook/instruments.json');
    expect(instrumentsPath(undefined, { XDG_CONFIG_HOME: 'relative' }, '/w')).toMatch(/\.config\/probebook\/instruments\.json$/);
  });

  test('a missing file, bad JSON and a FIFO are one line each, never a hang', async () => {
    await expect(loadInstruments(join(dir, 'none.json'))).rejects.toThrow(/not found; pass --instruments FILE/);
    writeFileSync(join(dir, 'bad.json'), '{"instruments": [');
    await expect(loadInstruments(join(dir, 'bad.json'))).rejects.toThrow(/not valid JSON/);
    execFileSync('mkfifo', [join(dir, 'fifo')]);
    await expect(loadInstruments(join(dir, 'fifo'))).rejects.toThrow(/not a regular file/);
  });
});
