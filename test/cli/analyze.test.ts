import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { main } from '../../src/cli/main.js';

const demo = join(import.meta.dirname, '..', '..', 'demo', 'captures');
const dir = mkdtempSync(join(tmpdir(), 'probebook-analyze-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]) {
  let stdout = '';
  let stderr = '';
  const status = await main(['analyze', ...argv], {
    stdout: (t) => void (stdout += t),
    stderr: (t) => void (stderr += t),
    env: {},
    cwd: demo,
  });
  return { status, stdout, stderr };
}

const contractKeys = ['samples', 'sampleRate', 'frequency', 'vpp', 'vrms', 'vrmsAc', 'mean', 'duty', 'rise', 'fall', 'thd', 'shape'];

describe('probebook analyze --json (DESIGN §7 contract)', () => {
  test('prints the contract keys first, in SI units', async () => {
    const r = await run('exciter-sine.csv', '--json');
    expect(r.status).toBe(0);
    expect(r.stderr).toBe('');
    const out = JSON.parse(r.stdout) as Record<string, unknown>;
    expect(Object.keys(out).slice(0, contractKeys.length)).toEqual(contractKeys);
    expect(out.samples).toBe(4000);
    // The demo script wrote 200 kS/s and 1372.4 Hz (invented).
    expect(out.sampleRate).toBeCloseTo(200e3, 3);
    expect(Math.abs((out.frequency as number) / 1372.4 - 1)).toBeLessThan(1e-4);
    expect(out.shape).toBe('sine');
    expect(out.duty).toBeNull();
    expect(out.rise).toBeNull();
    expect(typeof out.thd).toBe('number');
  });

  test('a square gives duty, rise and fall; --channel picks by number or name', async () => {
    const square = JSON.parse((await run('osc-square-triangle.csv', '--json', '--channel', '1')).stdout) as Record<string, number | string>;
    expect(square.shape).toBe('square');
    // The invented demo capture's square is symmetric: duty 50 % (IEEE 181 mid reference level).
    expect(Math.abs((square.duty as number) - 0.5)).toBeLessThan(0.01);
    // Single-pole edges with τ = 1.5 µs in the demo script: ln 9 · τ ≈ 3.30 µs (handbook), within 3 %.
    expect(Math.abs((square.rise as number) / (Math.log(9) * 1.5e-6) - 1)).toBeLessThan(0.03);
    const tri = JSON.parse((await run('osc-square-triangle.csv', '--json', '--channel=TRIANGLE')).stdout) as Record<string, unknown>;
    expect(tri.shape).toBe('triangle');
    expect(tri.channel).toBe('TRIANGLE');
  });

  test('--expect reports a mismatch as a warning line and a mismatch key', async () => {
    const r = await run('driver-notch.tsv', '--json', '--expect', 'sine');
    expect(r.status).toBe(0);
    expect(r.stderr).toMatch(/^probebook: warning: expected a sine; the capture has a crossover notch/);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    const out = JSON.parse(r.stdout) as Record<string, unknown>;
    expect(out.notch).toBe(true);
    expect(out.mismatch).toMatch(/crossover notch/);
    const ok = JSON.parse((await run('exciter-sine.csv', '--json', '--expect', 'sine')).stdout) as Record<string, unknown>;
    expect(ok.mismatch).toBeNull();
  });

  test('WAV with --scale', async () => {
    const out = JSON.parse((await run('osc-interface.wav', '--json', '--scale', '5', '--channel', '1')).stdout) as Record<string, number>;
    // The demo triangle has a 2.3 V peak (invented), 16-bit PCM at 5 V full scale.
    expect(Math.abs((out.vpp ?? 0) - 4.6)).toBeLessThan(0.02);
    expect(out.sampleRate).toBe(48000);
  });
});

describe('probebook analyze, readable summary', () => {
  test('shows the figures and a trace', async () => {
    const r = await run('driver-clipped.csv', '--log', dir);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('shape         other, clipped');
    expect(r.stdout).toContain('frequency     1.3724 kHz');
    expect(r.stdout).toContain('─ captured');
  });
});

describe('bad input: one line on stderr, exit 2', () => {
  test.each([
    [['missing.csv'], /missing.csv: no such file/],
    [['exciter-sine.csv', '--expect', 'sawtooth'], /--expect takes sine, square, triangle/],
    [['exciter-sine.csv', '--dt', '-1'], /--dt takes a positive time/],
    [['exciter-sine.csv', '--channel', '3'], /channel 3 does not exist; the capture has 1 \(TP4\)/],
    [[], /missing argument/],
  ])('%j', async (argv, message) => {
    const r = await run(...argv);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });

  test('empty, garbage, too short and NaN files', async () => {
    const files: [string, string | Uint8Array, RegExp][] = [
      ['empty.csv', '', /empty.csv: the file is empty/],
      ['garbage.bin', new Uint8Array([0, 255, 3, 0, 9, 1, 2]), /binary data/],
      ['short.csv', 'Time (s),V\n0,1\n1e-6,2\n2e-6,3\n', /only 3 samples/],
      ['nan.csv', 'Time (s),V\n0,1\n1e-6,NaN\n', /nan.csv, line 3: field 2 is not a number/],
    ];
    for (const [name, content, message] of files) {
      const path = join(dir, name);
      writeFileSync(path, content);
      const r = await run(path);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
  });
});
