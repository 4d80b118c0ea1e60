import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { main } from '../../src/cli/main.js';

/** A targets cache of this test file's own: no test writes into the user's cache folder. */
const cacheDir = mkdtempSync(join(tmpdir(), 'probebook-cache-'));

/** Run in-process with captured output, from the repository root. */
async function run(args: readonly string[]): Promise<{ status: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const status = await main(args, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), env: { PROBEBOOK_CACHE: cacheDir }, cwd: process.cwd() });
  return { status, stdout, stderr };
}

interface JsonTarget {
  check: string;
  stage: string;
  quantity: string;
  unit: string;
  nominal: number | null;
  worst: { min: number | null; max: number | null };
  stat: { min: number | null; max: number | null };
  testPoint: string | null;
}

const contractKeys = ['check', 'stage', 'quantity', 'unit', 'nominal', 'worst', 'stat', 'testPoint'];

describe.each(['demo/exciter.plan.json', 'demo/line-driver.plan.json'])('targets --json on %s', (file) => {
  test('prints the DESIGN §7 keys, bands that hold the nominal and stat inside worst', async () => {
    const r = await run(['targets', file, '--json', '--trials', '1000']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const json = JSON.parse(r.stdout) as { plan: string; targets: JsonTarget[]; warnings: { stage: string; message: string }[] };
    expect(Object.keys(json)).toEqual(['plan', 'targets', 'warnings']);
    expect(json.plan).toBe((JSON.parse(readFileSync(file, 'utf8')) as { plan: string }).plan);
    expect(json.targets.length).toBeGreaterThan(10);
    for (const t of json.targets) {
      expect(Object.keys(t)).toEqual(expect.arrayContaining(contractKeys));
      expect(typeof t.nominal).toBe('number');
      if (t.worst.max === null) continue; // one-sided: rail to ground
      const { min, max } = t.worst;
      expect(min).not.toBeNull();
      expect(t.nominal as number).toBeGreaterThanOrEqual(min as number);
      expect(t.nominal as number).toBeLessThanOrEqual(max);
      // DESIGN §4: the statistical band lies inside the worst-case band.
      expect(t.stat.min as number).toBeGreaterThanOrEqual(min as number);
      expect(t.stat.max as number).toBeLessThanOrEqual(max);
    }
    // Safe order: the unpowered checks first, then the idle current.
    const first = json.targets.findIndex((t) => !t.check.endsWith('.to-ground'));
    expect(json.targets.slice(0, first).every((t) => t.unit === 'Ω' && t.worst.max === null)).toBe(true);
    expect(json.targets[first]?.check).toBe('rails.idle-current');
    for (const w of json.warnings) expect(Object.keys(w)).toEqual(['stage', 'message']);
  });
});

describe('demo designs', () => {
  test('the exciter runs at 2–3 kHz with its pot centred and has no design warnings', async () => {
    const json = JSON.parse((await run(['targets', 'demo/exciter.plan.json', '--json', '--trials', '1000'])).stdout) as {
      targets: JsonTarget[];
      warnings: unknown[];
    };
    const f = json.targets.find((t) => t.check === 'osc.freq');
    // Ideal f = R2/(4·R1·R·Ct) of the demo plan's invented parts, about 2.4 kHz (Sedra and Smith, square/triangle generator); the slew correction stays within these bounds.
    expect(f?.nominal).toBeGreaterThan(2000);
    expect(f?.nominal).toBeLessThan(3000);
    // Ideal f = R2 / (4·R1·(Rt + RV·0.4)·Ct) = 22k / (4·10k·22k·10n) = 2.5 kHz (DESIGN §3); the slew time lowers it a little.
    expect(f?.nominal).toBeLessThan(2500);
    expect(f?.nominal).toBeGreaterThan(2500 * 0.9);
    expect(json.warnings).toEqual([]);
  });

  test('the line driver shows the crossover warning of its unbiased follower', async () => {
    const r = await run(['targets', 'demo/line-driver.plan.json']);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('Design warnings');
    expect(r.stdout).toMatch(/out: .*dead band/);
    expect(r.stdout).toContain('bench.relay.coil');
    // A table of about 100 columns.
    for (const line of r.stdout.split('\n')) expect([...line].length).toBeLessThanOrEqual(110);
  });
});
