import { readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { biasPlan, cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

// Issue 10, item 5: a damaged board is never counted from stale figures, and the
// batch says every time which boards it left out and why.
const t = tempDir('batch-damaged');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'tess', PROBEBOOK_CACHE: join(t.dir, 'cache') };
// Invented readings: B-2's 3.37 V is the one a damaged file must not keep in the figures.
const readings: [string, string][] = [
  ['B-1', '3.25'],
  ['B-2', '3.37'],
  ['B-3', '3.27'],
];

beforeAll(async () => {
  for (const [board, value] of readings) {
    const r = await cli(['record', '--plan', biasPlan, '--board', board, '--check', 'ref.out.dc', '--value', value], env);
    expect(r.status, r.stderr).toBe(0);
  }
  const before = JSON.parse((await cli(['batch', '--json'], env)).stdout) as { checks: { n: number }[] };
  expect(before.checks[0]?.n).toBe(3);
  // Damaged in place, as an editor or a failing disk would leave it (the boards folder's time does not move).
  writeFileSync(join(t.dir, 'boards', 'B-2.json'), '{"schemaVersion": 1, "serial": "B-2", "runs": [');
});

interface BatchJson {
  checks: { check: string; n: number; mean: number; max: number }[];
  problems: string[];
}

async function batchJson(): Promise<BatchJson> {
  const r = await cli(['batch', '--json'], env);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as BatchJson;
}

describe('batch with a damaged board file', () => {
  test('while the old index remains: the board is left out and named in problems', async () => {
    const out = await batchJson();
    const check = out.checks.find((c) => c.check === 'ref.out.dc');
    expect(check?.n).toBe(2);
    // Mean of the two good boards, hand arithmetic: (3.25 + 3.27) / 2.
    expect(check?.mean).toBeCloseTo(3.26, 12);
    expect(check?.max).toBeCloseTo(3.27, 12);
    expect(out.problems).toHaveLength(1);
    expect(out.problems[0]).toMatch(/^board B-2 is left out of these figures: board file .*B-2\.json cannot be read/);
  });

  test('after an index rebuild: the same, every time', async () => {
    for (const name of readdirSync(t.dir)) if (name.startsWith('index')) rmSync(join(t.dir, name));
    for (let i = 0; i < 2; i++) {
      const out = await batchJson();
      expect(out.checks.find((c) => c.check === 'ref.out.dc')?.n).toBe(2);
      expect(out.problems.filter((p) => p.includes('B-2'))).toHaveLength(1);
    }
  });

  test('the table says it in its first line and in a warning', async () => {
    const r = await cli(['batch'], env);
    expect(r.status).toBe(0);
    expect(r.stdout.split('\n')[0]).toMatch(/ · 2 boards .*· 1 left out \(damaged board file, see the warnings\)/);
    expect(r.stdout).toMatch(/warning: board B-2 is left out of these figures/);
  });

  test('the Markdown batch report lists it too', async () => {
    const r = await cli(['report', '--batch', '--format', 'md'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toContain('board B-2 is left out of these figures');
  });
});
