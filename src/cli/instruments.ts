import { addressText } from '../bench/address.js';
import { InstrumentError } from '../bench/errors.js';
import { instrumentsPath, loadInstruments } from '../bench/instruments-file.js';
import { BenchSession } from '../bench/session.js';
import { parseArgs } from './args.js';
import type { Command } from './command.js';

const usage = 'probebook instruments [--instruments FILE] [--json] | probebook instruments --simulate PLAN [--port N] [--write FILE] [--seed S]';

const help = `usage: ${usage}
Asks every instrument of the bench's instruments file for its identity (*IDN?),
all at once, each bounded by its own timeout, and prints its address and answer
or what went wrong.
  --instruments FILE  else $PROBEBOOK_INSTRUMENTS, else $XDG_CONFIG_HOME/probebook/instruments.json
  --json              {"instruments":[{"name","address","identity","error"}]}
  --simulate PLAN     serve a simulated bench on 127.0.0.1 (SCPI over TCP): a meter
                      answering each check of PLAN near its nominal target with a
                      little noise, and a scope record of the plan's last waveform;
                      until Ctrl-C. --port N (default 5025; 0 picks a free one),
                      --write FILE writes an instruments file that points at it.
The file (JSON): {"instruments": [{"name": "dmm", "address": "tcp://192.0.2.10:5025",
  "timeout": "3 s", "queries": {"V": "MEAS:VOLT:DC?", "osc.duty": {"query": "MEAS:DUTY?", "scale": 0.01}}}]}
addresses: tcp://HOST[:PORT] (port 5025 when left out), serial://DEVICE?baud=N, usbtmc://DEVICE.
`;

/** `probebook instruments` (DESIGN §7a): identity of every instrument, in parallel. */
export const instrumentsCommand: Command = async (argv, io) => {
  const args = parseArgs(argv, {
    options: { instruments: 'string', json: 'boolean', help: 'boolean', simulate: 'string', port: 'string', write: 'string', seed: 'string', log: 'string' },
    usage,
  });
  if (args.options.help) {
    io.stdout(help);
    return 0;
  }
  if (typeof args.options.simulate === 'string') {
    const { simulateBench } = await import('./instruments-simulate.js');
    return simulateBench(args.options, io);
  }
  const file = await loadInstruments(instrumentsPath(typeof args.options.instruments === 'string' ? args.options.instruments : undefined, io.env, io.cwd));
  const session = new BenchSession(file);
  try {
    const rows = await Promise.all(
      file.instruments.map(async (inst) => {
        try {
          return { name: inst.name, address: addressText(inst.address), identity: await session.identity(inst), error: null };
        } catch (error) {
          const message = error instanceof InstrumentError ? error.detail : error instanceof Error ? error.message : String(error);
          return { name: inst.name, address: addressText(inst.address), identity: null, error: message };
        }
      }),
    );
    if (args.options.json) io.stdout(`${JSON.stringify({ instruments: rows })}\n`);
    else {
      if (rows.length === 0) io.stdout(`${file.file} lists no instrument\n`);
      const width = Math.max(4, ...rows.map((r) => r.name.length));
      for (const r of rows) io.stdout(`${r.name.padEnd(width)}  ${r.address}  ${r.identity ?? `no answer: ${r.error}`}\n`);
    }
    return 0;
  } finally {
    session.close();
  }
};
