import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { harmonicAnalysis } from '../../src/signal/harmonics.js';
import { measure } from '../../src/signal/measure.js';
import { readCaptureBytes } from '../../src/signal/read-capture.js';

// ngspice (Debian package `ngspice`, an independent simulator) runs a transient,
// prints its own Fourier analysis of the last period (`fourier`), and writes the
// waveform resampled to a fixed step (`linearize`). We write that waveform as a
// scope would export it, read it back through our CSV reader and compare.
const f = 1372.4; // Hz, invented
const step = 0.5e-6;
const harmonics = 20; // ngspice's nfreqs: harmonics 0…19

interface SpiceRun {
  readonly csv: string;
  readonly thd: number;
  /** Normalised magnitudes by harmonic number (1 = fundamental). */
  readonly norm: number[];
}

function simulate(netlist: string): SpiceRun {
  const dir = mkdtempSync(join(tmpdir(), 'probebook-capture-spice-'));
  try {
    const out = join(dir, 'out.txt');
    const deck = `* invented test circuit\n${netlist}\n.control\nset nfreqs=${harmonics}\nset wr_singlescale\noption numdgt=12\ntran ${step} 13m 2m ${step}\nfourier ${f} v(out)\nlinearize v(out)\nwrdata ${out} v(out)\nquit\n.endc\n.end\n`;
    const file = join(dir, 'deck.cir');
    writeFileSync(file, deck);
    const stdout = execFileSync('ngspice', ['-b', file], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'], timeout: 120_000 });
    const thd = Number(/THD:\s*([\d.eE+-]+)\s*%/.exec(stdout)?.[1]) / 100;
    const norm: number[] = [];
    for (const m of stdout.matchAll(/^\s*(\d+)\s+[\d.eE+-]+\s+[\d.eE+-]+\s+[\d.eE+-]+\s+([\d.eE+-]+)\s+[\d.eE+-]+\s*$/gm)) {
      norm[Number(m[1])] = Number(m[2]);
    }
    const rows = readFileSync(out, 'utf8')
      .trim()
      .split('\n')
      .map((l) => l.trim().split(/\s+/));
    const csv = `Time (s),OUT (V)\n${rows.map(([t, v]) => `${t},${v}`).join('\n')}\n`;
    return { csv, thd, norm };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const rails = 'Vp vp 0 12\nVn vn 0 -12\n.model QN npn(is=1e-14 bf=150)\n.model QP pnp(is=1e-14 bf=150)\n.model DS d(is=2.52n n=1.752 rs=0.568)';

function analyse(run: SpiceRun) {
  const capture = readCaptureBytes(new TextEncoder().encode(run.csv), { name: 'spice.csv' });
  const samples = capture.channels[0]?.samples ?? new Float64Array();
  // The simulator's time step, as written.
  expect(capture.dt).toBeCloseTo(step, 12);
  const m = measure(samples, capture.sampleRate).measurements;
  const period = capture.sampleRate / (m.frequency ?? 1);
  const h = harmonicAnalysis(samples, 0, period, Math.floor(samples.length / period), m.mean, harmonics - 1);
  return { m, h };
}

describe('captures simulated by ngspice', () => {
  test('an unbiased push-pull follower: notch found, harmonics as ngspice computes them', () => {
    const run = simulate(`${rails}\nVin in 0 sin(0 4.8 ${f})\nQ1 vp in out QN\nQ2 vn in out QP\nRl out 0 1k`);
    const { m, h } = analyse(run);
    expect(m.notch).toBe(true);
    expect(m.clipped).toBe(false);
    // The source frequency, to 0.01 %.
    expect(Math.abs((m.frequency ?? 0) / f - 1)).toBeLessThan(1e-4);
    // ngspice's Fourier of the last period (linear interpolation on 200 points):
    // normalised harmonics within 0.002, THD over 2…19 within 2 %.
    for (let k = 2; k < harmonics; k++) {
      expect(Math.abs((h.amplitudes[k] ?? 0) / (h.amplitudes[1] ?? 1) - (run.norm[k] ?? Number.NaN))).toBeLessThan(2e-3);
    }
    expect(Math.abs(h.thd / run.thd - 1)).toBeLessThan(0.02);
  });

  test('the same follower biased by two diodes has no notch and far less distortion', () => {
    const run = simulate(
      `${rails}\nVin in 0 sin(0 4.8 ${f})\nRb1 vp bp 4.7k\nD1 bp in DS\nD2 in bn DS\nRb2 bn vn 4.7k\nQ1 vp bp out QN\nQ2 vn bn out QP\nRl out 0 1k`,
    );
    const { m, h } = analyse(run);
    expect(m.notch).toBe(false);
    expect(m.shape).toBe('sine');
    // ngspice's own .four THD of the same run: 5 % of it; below 2 % absolute with the diode bias (Horowitz and Hill, biased push-pull followers).
    expect(Math.abs(h.thd / run.thd - 1)).toBeLessThan(0.05);
    expect(m.thd).toBeLessThan(0.02);
  });

  test('a sine limited at ±10.2 V: flat tops found, THD as ngspice computes it', () => {
    const run = simulate(`Vin in 0 sin(0 13.5 ${f})\nB1 out 0 V = max(min(v(in), 10.2), -10.2)\nRl out 0 1k`);
    const { m, h } = analyse(run);
    expect(m.clipped).toBe(true);
    expect(m.notch).toBe(false);
    expect(Math.abs(h.thd / run.thd - 1)).toBeLessThan(0.02);
    // Peak-to-peak of the limit itself.
    expect(Math.abs(m.vpp - 20.4)).toBeLessThan(0.01);
  });
});
