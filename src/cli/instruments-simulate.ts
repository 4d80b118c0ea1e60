import { writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { createRandom } from '../analysis/random.js';
import { computeTargets } from '../analysis/targets.js';
import type { Target } from '../analysis/types.js';
import { startScpiServer } from '../bench/scpi-server.js';
import { buildChain } from '../plan/chain.js';
import { loadPlanFile } from '../plan/load.js';
import type { Plan } from '../plan/types.js';
import type { CommandIo } from './command.js';
import { UsageError } from './errors.js';

/** What the simulated meter reads for a check: near its nominal, with a little noise. */
export function simulatedValue(t: Target, normal: () => number): number {
  const { min, max } = t.worst;
  if (t.isLimit) {
    // A healthy board: well clear of the limit (rail to ground in kΩ, idle current at 60 % of its maximum).
    if (Number.isFinite(min) && !Number.isFinite(max)) return min * 40 * (1 + 0.05 * normal());
    if (Number.isFinite(max)) return max * 0.6 * (1 + 0.02 * normal());
  }
  // One twelfth of the band as the spread: a well-built board sits inside it.
  const width = Number.isFinite(max - min) ? max - min : Math.abs(t.nominal) * 0.02;
  const v = t.nominal + (width / 12) * normal();
  return Number.isFinite(min) && min >= 0 ? Math.max(0, v) : v;
}

/** SCPI numbers as a meter sends them (NR3, 6 significant digits). */
function nr3(value: number): string {
  return value
    .toExponential(5)
    .toUpperCase()
    .replace(/E([+-])(\d)$/, 'E$10$2');
}

/** The plan's last stage output with a waveform, as 8-bit codes over three periods. */
function scopeRecord(plan: Plan): { codes: Int8Array; dt: number; yscale: number } | null {
  const chain = buildChain(plan);
  const detail = chain.detail(chain.nominal);
  for (const stage of [...plan.stages].reverse()) {
    for (const output of stage.module.outputs) {
      const w = detail.outputs[`${stage.id}.${output}`];
      if (!w || w.frequency <= 0 || w.samples.length < 8) continue;
      const n = w.samples.length;
      const points = 1200;
      let peak = 0;
      for (const v of w.samples) peak = Math.max(peak, Math.abs(v));
      const yscale = peak > 0 ? peak / 100 : 0.01;
      const codes = new Int8Array(points);
      for (let i = 0; i < points; i++) {
        const v = w.samples[Math.floor(((i * 3) / points) * n) % n] ?? 0;
        codes[i] = Math.max(-127, Math.min(127, Math.round(v / yscale)));
      }
      return { codes, dt: 3 / w.frequency / points, yscale };
    }
  }
  return null;
}

/**
 * `probebook instruments --simulate PLAN`: a simulated bench on loopback for
 * trying `record --from` and the bring-up screen's instrument key with no
 * hardware. Invented SCPI: `SIM:MEAS? <check id>` reads one check.
 */
export async function simulateBench(options: Readonly<Record<string, string | boolean | undefined>>, io: CommandIo): Promise<number> {
  const plan = await loadPlanFile(String(options.simulate), { cwd: io.cwd });
  const port = options.port === undefined ? 5025 : Number(options.port);
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new UsageError(`--port ${JSON.stringify(options.port)} is not 0…65535`);
  const seed = options.seed === undefined ? Date.now() % 2 ** 31 : Number(options.seed);
  if (!Number.isInteger(seed)) throw new UsageError('--seed must be a whole number');
  const targets = computeTargets(plan).targets;
  const byCheck = new Map(targets.map((t) => [t.check.toLowerCase(), t] as const));
  const random = createRandom(seed);
  const record = scopeRecord(plan);
  const answer = (line: string) => {
    const command = line.trim();
    const upper = command.toUpperCase();
    if (upper === '*IDN?') return 'probebook,simulated bench,SIM-0001,1.0';
    if (upper === '*RST' || upper === '*CLS') return null;
    const meas = /^SIM:MEAS\?\s+"?([^"\s]+)"?$/i.exec(command);
    if (meas) {
      const t = byCheck.get((meas[1] ?? '').toLowerCase());
      return t ? nr3(simulatedValue(t, () => random.normal())) : '-224,"Illegal parameter value"';
    }
    if (record) {
      if (upper === 'WAV:XINC?') return nr3(record.dt);
      if (upper === 'WAV:YINC?') return nr3(record.yscale);
      if (upper === 'WAV:YOR?') return '0';
      if (upper === 'WAV:DATA?') {
        const bytes = Buffer.from(record.codes.buffer, record.codes.byteOffset, record.codes.byteLength);
        const len = String(bytes.length);
        return Buffer.concat([Buffer.from(`#${len.length}${len}`, 'latin1'), bytes, Buffer.from('\n')]);
      }
    }
    return '-113,"Undefined header"';
  };
  let server;
  try {
    server = await startScpiServer(answer, { port });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'EADDRINUSE') throw new UsageError(`port ${port} on 127.0.0.1 is in use; pass --port N (0 picks a free one)`);
    throw error;
  }
  const address = `tcp://127.0.0.1:${server.port}`;
  const file = {
    instruments: [
      { name: 'sim-meter', address, timeout: '2 s', queries: Object.fromEntries(targets.map((t) => [t.check, `SIM:MEAS? ${t.check}`])) },
      ...(record
        ? [
            {
              name: 'sim-scope',
              address,
              timeout: '2 s',
              queries: {},
              capture: { data: 'WAV:DATA?', format: 'int8', xincrement: 'WAV:XINC?', yscale: 'WAV:YINC?', yoffset: 'WAV:YOR?' },
            },
          ]
        : []),
    ],
  };
  if (typeof options.write === 'string') {
    const path = resolve(io.cwd, options.write);
    await writeFile(path, `${JSON.stringify(file, null, 2)}\n`);
    io.stdout(`instruments file written to ${path}\n`);
  }
  io.stdout(`simulated bench for plan ${plan.plan} at ${address} (invented values near the targets; not a real board)\n`);
  io.stdout(
    `try: probebook record --plan ${String(options.simulate)} --board SIM-1 --check ${targets[0]?.check ?? 'ID'} --from sim-meter${typeof options.write === 'string' ? ` --instruments ${options.write}` : ''}\n`,
  );
  io.stdout('Ctrl-C stops it.\n');
  await new Promise<void>((done) => {
    const stop = () => {
      process.off('SIGINT', stop);
      process.off('SIGTERM', stop);
      done();
    };
    process.on('SIGINT', stop);
    process.on('SIGTERM', stop);
  });
  await server.close();
  return 0;
}
