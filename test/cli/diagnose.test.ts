import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { biasPlan, cli, cliProcess } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

const t = tempDir('diagnose');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'tess', PROBEBOOK_CACHE: `${t.dir}/cache` };

async function record(board: string, readings: readonly (readonly [string, string])[]): Promise<void> {
  for (const [check, value] of readings) {
    const r = await cli(['record', '--plan', biasPlan, '--board', board, '--check', check, '--value', value], env);
    expect(r.status, r.stderr).toBe(0);
  }
}

// Invented boards on the bias fixture (ref: 6k8 over 3k3 from +10 V; neg: 12k over 8k2 from −10 V).
// D-001 has a 3k6 fitted for ref.Rbottom (the E24 neighbour of 3k3): the divider formula
// V·Rb/(Rt + Rb) gives 10.01 · 3600 / 10 400 = 3.465 V, typed as 3.465.
beforeAll(async () => {
  await record('D-001', [
    ['rails.+10V.dc', '10.01'],
    ['rails.-10V.dc', '-9.99'],
    ['ref.out.dc', '3.465'],
    ['neg.out.dc', '-4.054'],
  ]);
  await record('D-002', [
    ['rails.+10V.dc', '10.00'],
    ['ref.out.dc', '3.268'],
  ]);
}, 60_000);

describe('probebook diagnose', () => {
  test('--json names the neighbour value fitted, with the contract keys', async () => {
    const r = await cli(['diagnose', 'D-001', '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out).slice(0, 5)).toEqual(['serial', 'run', 'plan', 'hypotheses', 'unexplained']);
    expect(out).toMatchObject({ serial: 'D-001', plan: 'bias-ref-a', unexplained: [] });
    const first = out.hypotheses[0];
    for (const key of ['rank', 'part', 'ref', 'mode', 'value', 'label', 'score', 'explains', 'predicted']) expect(first).toHaveProperty(key);
    expect(first).toMatchObject({ rank: 1, part: 'ref.Rbottom', ref: null, mode: 'value', value: 3600, explains: ['ref.out.dc'] });
    expect(first.score).toBeGreaterThan(0.5);
    expect(first.score).toBeLessThanOrEqual(1);
    // Divider formula with the rail as read is 3.4650 V; the model takes the nominal 10 V rail: 3.4615 V.
    expect(first.predicted['ref.out.dc']).toBeCloseTo((10 * 3600) / 10_400, 6);
    const total = out.hypotheses.reduce((s: number, h: { score: number }) => s + h.score, 0);
    expect(total).toBeCloseTo(1, 3);
  });

  test('readable: ranked lines in bench words, the caution last', async () => {
    const r = await cli(['diagnose', 'D-001', '--top', '1'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^board D-001 · run \S+ · plan bias-ref-a · 4 readings/);
    expect(r.stdout).toContain('ref.Rbottom would be 3.6 kΩ, the series neighbour of the fitted 3.3 kΩ');
    expect(r.stdout).not.toMatch(/^ 2\./m);
    expect(r.stdout).toMatch(/caution: power off/);
  });

  test('a board whose readings all pass gets no hypothesis and says so', async () => {
    const r = await cli(['diagnose', 'D-002', '--json'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout)).toMatchObject({ hypotheses: [], unexplained: [] });
    expect((await cli(['diagnose', 'D-002'], env)).stdout).toContain('every reading passed: nothing to explain');
  });

  test('bad input exits 2 with one line; --help exits 0', async () => {
    for (const argv of [['diagnose', 'D-001', '--top', 'x'], ['diagnose', 'D-001', '--run', 'nope'], ['diagnose', 'NO-SUCH'], ['diagnose']]) {
      const r = await cli(argv, env);
      expect(r.status, argv.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    const help = cliProcess(['diagnose', '--help'], env);
    expect(help.status).toBe(0);
    expect(help.stdout).toContain('usage: probebook diagnose SERIAL');
  });
});

describe('probebook diagnose on a PostgreSQL log', () => {
  test('the same answer as on the folder', async () => {
    const { freshDatabase } = await import('../helpers/pg-database.js');
    const db = await freshDatabase('diagnose');
    try {
      const pgEnv = { ...env, PROBEBOOK_LOG: db.url };
      for (const [check, value] of [
        ['rails.+10V.dc', '10.01'],
        ['ref.out.dc', '3.465'],
      ] as const) {
        const r = await cli(['record', '--plan', biasPlan, '--board', 'D-101', '--check', check, '--value', value], pgEnv);
        expect(r.status, r.stderr).toBe(0);
      }
      const r = await cli(['diagnose', 'D-101', '--json'], pgEnv);
      expect(r.status, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).hypotheses[0]).toMatchObject({ part: 'ref.Rbottom', mode: 'value', value: 3600 });
    } finally {
      await db.drop();
    }
  });
});
