import { spawnSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

// The demo log as `npm start` makes it (demo/make-demo-log.ts, invented boards), diagnosed.
const t = tempDir('diagnose-demo');
afterAll(() => t.remove());
const env = { PROBEBOOK_CACHE: `${t.dir}/cache` };

beforeAll(() => {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'demo/make-demo-log.ts', `${t.dir}/log`], { encoding: 'utf8' });
  expect(r.status, r.stderr).toBe(0);
  // The script warns when the diagnosis misses a planted fault.
  expect(r.stderr).not.toContain('does not list');
}, 120_000);

async function diagnosed(serial: string) {
  const r = await cli(['diagnose', serial, '--json', '--log', `${t.dir}/log`], env);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as {
    hypotheses: { part: string; ref: string | null; mode: string; value: number | null; label: string; alternatives: { part: string }[] }[];
    unexplained: string[];
  };
}

describe('diagnose on the demo log', () => {
  test('the zener fitted backwards names the zener pair first, with its designators', async () => {
    const d = await diagnosed('EXB-0110');
    expect(d.hypotheses[0]).toMatchObject({ part: 'osc.clamp', ref: 'D3/D4', mode: 'reversed', value: null });
    expect(d.hypotheses[0]?.label).toMatch(/^osc\.clamp \(D3\/D4\) reversed/);
    expect(d.unexplained).toEqual([]);
  });

  test('the decade-low timing capacitor and the neighbour feedback resistor are named first', async () => {
    const ct = await diagnosed('EXB-0111');
    expect(ct.hypotheses[0]).toMatchObject({ part: 'osc.Ct', ref: 'C7', mode: 'value' });
    // 1 nF for 10 nF (IEC 60063 E12 value, a decade below).
    expect(ct.hypotheses[0]?.value).toBeCloseTo(1e-9, 15);
    const rf = await diagnosed('EXB-0112');
    expect(rf.hypotheses[0]).toMatchObject({ part: 'gain.Rf', ref: 'R14', mode: 'value', value: 16_000 });
  });

  test('a board that passed gets no hypothesis', async () => {
    for (const serial of ['EXB-0101', 'EXB-0105', 'LDR-0201']) {
      const d = await diagnosed(serial);
      expect(d.hypotheses, serial).toEqual([]);
      expect(d.unexplained, serial).toEqual([]);
    }
  });
});
