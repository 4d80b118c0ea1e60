import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** Columns written by ngspice's `wrdata`, by vector name (the scale first). */
export type SpiceTable = Record<string, Float64Array>;

/**
 * Run ngspice (Debian package `ngspice`, an independent simulator) in batch mode
 * on `netlist` (elements and models, no `.control` and no `.end`), run `analysis`
 * (e.g. `tran 1u 20m 10m uic` or `dc vin -5 5 0.01` or `ac dec 50 1 10meg`) and
 * return the listed vectors. `.ci/run` installs ngspice; a missing binary fails the test.
 */
export function runSpice(netlist: string, analysis: string, vectors: readonly string[]): SpiceTable {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-spice-'));
  try {
    const out = join(dir, 'out.txt');
    const deck = `* probebook test deck\n${netlist}\n.control\nset wr_singlescale\nset wr_vecnames\noption numdgt=12\n${analysis}\nwrdata ${out} ${vectors.join(' ')}\nquit\n.endc\n.end\n`;
    const file = join(dir, 'deck.cir');
    writeFileSync(file, deck);
    execFileSync('ngspice', ['-b', file], { stdio: ['ignore', 'pipe', 'pipe'], timeout: 300_000 });
    const lines = readFileSync(out, 'utf8').trim().split('\n');
    const header = (lines[0] ?? '').trim().split(/\s+/);
    const rows = lines.slice(1).map((l) => l.trim().split(/\s+/).map(Number));
    const table: SpiceTable = {};
    header.forEach((name, c) => {
      table[name] = Float64Array.from(rows, (r) => r[c] ?? Number.NaN);
    });
    return table;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The −3 dB frequency of an ngspice AC sweep, log-interpolated between points. */
export function corner(freq: Float64Array, mag: Float64Array): number {
  const target = (mag[0] as number) / Math.SQRT2;
  for (let i = 1; i < freq.length; i++) {
    const m0 = mag[i - 1] as number;
    const m1 = mag[i] as number;
    if (m1 <= target && m0 > target) {
      const w = (m0 - target) / (m0 - m1);
      return Math.exp(Math.log(freq[i - 1] as number) * (1 - w) + Math.log(freq[i] as number) * w);
    }
  }
  return Number.NaN;
}
