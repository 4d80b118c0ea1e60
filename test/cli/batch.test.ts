import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, test } from 'vitest';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { fillDemoLog, latestFreq } from '../review/demo-boards.js';
import { makeLog, type TestLog } from '../review/real-log.js';
import { run } from './batch-run.js';

let t: TestLog;
beforeAll(async () => {
  t = await makeLog();
  await fillDemoLog(t);
});

describe('batch --json', () => {
  test('prints the contract keys first, per check, from the latest reading of each board', async () => {
    const r = await run(['batch', '--json', '--log', t.dir]);
    // Only progress of the one-time target computation may appear on stderr.
    expect(r.stderr.split('\n').filter((l) => l !== '' && !l.startsWith('computing the targets'))).toEqual([]);
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout) as { checks: Record<string, unknown>[] };
    for (const c of doc.checks) {
      // DESIGN §7 contract: these keys, in this order, then ours.
      expect(Object.keys(c).slice(0, 11)).toEqual(['check', 'n', 'pass', 'marginal', 'fail', 'mean', 'sd', 'min', 'max', 'cp', 'cpk']);
    }
    const freq = doc.checks.find((c) => c.check === 'osc.freq');
    const band = t.target('osc.freq').worst;
    // The invented readings: 3902 Hz lies above the band, the rest inside.
    expect(latestFreq.filter((f) => f > band.max)).toEqual([3902]);
    expect(freq).toMatchObject({ n: 6, pass: 5, marginal: 0, fail: 1, min: 3498, max: 3902, unit: 'Hz' });
    // Mean and sample sd against simple-statistics; Cp, Cpk by NIST/SEMATECH §6.1.6 (from memory); abs 1e-9 for mean and sd, 1e-12 for Cp and Cpk.
    const m = mean(latestFreq);
    const s = sampleStandardDeviation(latestFreq);
    expect(freq?.mean as number).toBeCloseTo(m, 9);
    expect(freq?.sd as number).toBeCloseTo(s, 9);
    // NIST/SEMATECH e-Handbook §6.1.6: Cp = (USL − LSL)/(6σ), Cpk = min(USL − μ, μ − LSL)/(3σ).
    expect(freq?.cp as number).toBeCloseTo((band.max - band.min) / (6 * s), 12);
    expect(freq?.cpk as number).toBeCloseTo(Math.min(band.max - m, m - band.min) / (3 * s), 12);
    // PB-0003 failed first, PB-0006 fails still: first-pass 4 of 6, final 5 of 6.
    expect(freq?.firstPassYield as number).toBeCloseTo(4 / 6, 12);
    expect(freq?.finalYield as number).toBeCloseTo(5 / 6, 12);
    expect(((freq?.outliers ?? []) as { serial: string }[]).map((o) => o.serial)).toEqual(['PB-0006']);
  });

  test('zero spread gives sd 0, null cp and cpk and a no-spread status, never NaN', async () => {
    const r = await run(['batch', '--json', '--check', 'osc.duty', '--log', t.dir]);
    const doc = JSON.parse(r.stdout) as { checks: Record<string, unknown>[] };
    expect(doc.checks).toHaveLength(1);
    expect(doc.checks[0]).toMatchObject({ check: 'osc.duty', n: 6, sd: 0, cp: null, cpk: null, status: 'no-spread' });
    expect(r.stdout).not.toMatch(/NaN|Infinity/);
  });

  test('--plan filters; an unknown plan or check is exit 2 with one line naming what exists', async () => {
    const ok = await run(['batch', '--json', '--plan', 'osc-demo', '--log', t.dir]);
    expect(ok.status).toBe(0);
    const bad = await run(['batch', '--plan', 'nope', '--log', t.dir]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/^probebook: no boards of plan "nope" .*plans there: osc-demo\n$/);
    const badCheck = await run(['batch', '--check', 'osc.nothing', '--log', t.dir]);
    expect(badCheck.status).toBe(2);
    expect(badCheck.stderr.split('\n')).toHaveLength(2);
  });

  test('bad dates and revisions are exit 2 with what to type', async () => {
    for (const argv of [
      ['--from', 'monday'],
      ['--to', '2026-13-01'],
      ['--from', '2026-11-05', '--to', '2026-11-01'],
      ['--rev', 'xyz'],
    ]) {
      const r = await run(['batch', ...argv, '--log', t.dir]);
      expect(r.status, argv.join(' ')).toBe(2);
      expect(r.stderr).toMatch(/^probebook: .+\n$/);
    }
  });

  test('a date range that excludes every reading gives an empty, honest table', async () => {
    const r = await run(['batch', '--to', '2001-01-01', '--log', t.dir]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('no readings match');
    const j = await run(['batch', '--json', '--from', '2001-01-01', '--to', '2001-01-02', '--log', t.dir]);
    expect(JSON.parse(j.stdout)).toMatchObject({ checks: [], boards: 0, firstPassYield: null });
  });
});

describe('batch table', () => {
  test('lists the weakest check first, with words beside the figures', async () => {
    const r = await run(['batch', '--log', t.dir]);
    expect(r.status).toBe(0);
    const rows = r.stdout.split('\n').filter((l) => /^(osc|rails)\./.test(l));
    // osc.freq is the only check with a failing board: lowest final yield.
    expect(rows[0]).toMatch(/^osc\.freq\s+6\s+5\s+0\s+1\s+83\.3 %/);
    expect(r.stdout).toContain('first-pass yield 66.7 % (4/6)');
    expect(r.stdout).toContain('PB-0006 (osc.freq 3.902 kHz, outside band)');
    expect(r.stdout).toMatch(/osc\.duty: not enough data/);
  });

  test('a log folder that does not exist is exit 2 and is not created', async () => {
    const missing = join(t.dir, 'no-such-log');
    const r = await run(['batch', '--log', missing]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`probebook: there is no log at ${missing}; check --log (or $PROBEBOOK_LOG), or record a reading first\n`);
    expect(existsSync(missing)).toBe(false);
  });

  test('an empty log says so and exits 0', async () => {
    const empty = await makeLog();
    const r = await run(['batch', '--log', empty.dir]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('0 boards');
  });
});

describe('help', () => {
  test('batch --help and report --batch --help print the options and exit 0', async () => {
    const b = await run(['batch', '--help']);
    expect(b.status).toBe(0);
    expect(b.stdout).toContain('--from/--to');
    const r = await run(['report', '--batch', '--help']);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('--format md|csv');
  });
});
