import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { afterAll, describe, expect, test } from 'vitest';
import { freshDatabase } from '../helpers/pg-database.js';
import { biasPlan, cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

const cleanups: (() => unknown)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

// Invented readings on the bias fixture board: ref.out.dc near 10 V · 3k3/(6k8+3k3) = 3.267 V.
const values = ['3.25', '3.27', '3.29', '3.31', '3.24', '3.26'];

async function folderLog(): Promise<string> {
  const t = tempDir('copy-src');
  cleanups.push(t.remove);
  const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'cora' };
  for (const [i, v] of values.entries()) {
    const board = `CP-${String(i + 1).padStart(3, '0')}`;
    for (const [check, value] of [
      ['rails.+10V.to-ground', '15k'],
      ['ref.out.dc', v],
      ['neg.out.dc', '-4.06'],
    ] as const) {
      const r = await cli(['record', '--plan', biasPlan, '--board', board, '--check', check, '--value', value], env);
      expect(r.status, r.stderr).toBe(0);
    }
  }
  return t.dir;
}

describe('probebook log copy FROM TO (DESIGN §6)', () => {
  test('folder → database → folder gives byte-identical history --json and batch --json; a second copy adds nothing', async () => {
    const src = await folderLog();
    const db = await freshDatabase('copy');
    cleanups.push(db.drop);
    const back = tempDir('copy-back');
    cleanups.push(back.remove);

    const first = await cli(['log', 'copy', src, db.url, '--json']);
    expect(first.status, first.stderr).toBe(0);
    expect(JSON.parse(first.stdout)).toMatchObject({ boards: 6, copied: { runs: 6, readings: 18 }, unchanged: 0, skipped: [] });
    const again = await cli(['log', 'copy', src, db.url, '--json']);
    expect(JSON.parse(again.stdout)).toMatchObject({ boards: 6, copied: { runs: 0, readings: 0, rework: 0, captures: 0 }, unchanged: 6 });
    const down = await cli(['log', 'copy', db.url, back.dir]);
    expect(down.status, down.stderr).toBe(0);
    expect(down.stdout).not.toContain('probebook-test');
    expect(down.stdout).toContain('postgres://postgres:***@');

    for (const i of [1, 4, 6]) {
      const serial = `CP-00${i}`;
      const a = await cli(['history', serial, '--json', '--log', src]);
      const b = await cli(['history', serial, '--json', '--log', db.url]);
      const c = await cli(['history', serial, '--json', '--log', back.dir]);
      expect(a.status, a.stderr).toBe(0);
      expect(b.stdout).toBe(a.stdout);
      expect(c.stdout).toBe(a.stdout);
    }
    const batchA = await cli(['batch', '--json', '--log', src]);
    const batchB = await cli(['batch', '--json', '--log', db.url]);
    const batchC = await cli(['batch', '--json', '--log', back.dir]);
    expect(batchA.status, batchA.stderr).toBe(0);
    expect(batchB.stdout).toBe(batchA.stdout);
    expect(batchC.stdout).toBe(batchA.stdout);

    // The batch figures from the database against simple-statistics on the same latest readings
    // (NIST/SEMATECH e-Handbook §6.1.6: sample mean and standard deviation; Cp = (USL − LSL)/6s).
    const ref = JSON.parse(batchB.stdout).checks.find((c: { check: string }) => c.check === 'ref.out.dc');
    const xs = values.map(Number);
    expect(ref.n).toBe(6);
    expect(ref.mean).toBeCloseTo(mean(xs), 12);
    expect(ref.sd).toBeCloseTo(sampleStandardDeviation(xs), 12);
    expect(ref.min).toBe(Math.min(...xs));
    expect(ref.max).toBe(Math.max(...xs));
  }, 120_000);

  test('a damaged board file in FROM is one line and skipped; the rest is copied (exit 1)', async () => {
    const src = await folderLog();
    writeFileSync(join(src, 'boards', 'CP-003.json'), '{"schemaVersion": 1, "serial": "CP-003", "runs": [');
    const db = await freshDatabase('damaged');
    cleanups.push(db.drop);
    const r = await cli(['log', 'copy', src, db.url, '--json']);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^probebook: skipped board CP-003: .*CP-003\.json/);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(JSON.parse(r.stdout)).toMatchObject({ boards: 6, copied: { readings: 15 }, skipped: [{ serial: 'CP-003' }] });
  }, 120_000);

  test('bad arguments exit 2', async () => {
    expect((await cli(['log', 'copy', '/nonexistent/log', '/tmp/x'])).status).toBe(2);
    expect((await cli(['log', 'move', 'a', 'b'])).status).toBe(2);
    expect((await cli(['log', 'copy', 'a'])).status).toBe(2);
  });
});
