import { beforeAll, describe, expect, test } from 'vitest';
import { parse } from 'csv-parse/sync';
import { reportBatchCommand } from '../../src/cli/report-batch.js';
import { fillDemoLog } from '../review/demo-boards.js';
import { makeLog, type TestLog } from '../review/real-log.js';
import { UsageError } from '../../src/cli/errors.js';
import { cacheDir, run } from './batch-run.js';

async function report(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const status = await reportBatchCommand(argv, {
    stdout: (x) => (stdout += x),
    stderr: (x) => (stderr += x),
    env: { PROBEBOOK_CACHE: cacheDir },
    cwd: process.cwd(),
  });
  return { status, stdout, stderr };
}

let t: TestLog;
beforeAll(async () => {
  t = await makeLog();
  await fillDemoLog(t);
});

describe('report --batch', () => {
  test('the CSV, parsed by csv-parse (RFC 4180), matches batch --json figure for figure', async () => {
    const csv = await report(['--batch', '--format', 'csv', '--log', t.dir]);
    expect(csv.status).toBe(0);
    // RFC 4180 §2.1: CRLF line ends.
    expect(csv.stdout.endsWith('\r\n')).toBe(true);
    const rows = parse(csv.stdout, { columns: true, skip_empty_lines: true }) as Record<string, string>[];
    const json = JSON.parse((await run(['batch', '--json', '--log', t.dir])).stdout) as { checks: Record<string, unknown>[] };
    expect(rows.map((r) => r.check)).toEqual(json.checks.map((c) => c.check));
    const num = (text: string | undefined) => (text === undefined || text === '' ? null : Number(text));
    for (const [i, c] of json.checks.entries()) {
      const row = rows[i] ?? {};
      for (const key of ['n', 'pass', 'marginal', 'fail', 'mean', 'sd', 'min', 'max', 'cp', 'cpk']) {
        // Exact: the CSV writes every digit of the double.
        expect(num(row[key]), `${String(c.check)} ${key}`).toBe(c[key]);
      }
      expect(num(row.first_pass_yield)).toBe(c.firstPassYield);
      expect(num(row.final_yield)).toBe(c.finalYield);
      expect(row.status).toBe(c.status);
      expect(row.unit).toBe(c.unit);
    }
  });

  test('the Markdown report names the yields, the weakest check first and the outlier boards', async () => {
    const md = await report(['--batch', '--format', 'md', '--plan', 'osc-demo', '--log', t.dir]);
    expect(md.status).toBe(0);
    expect(md.stdout).toContain('# Batch review');
    expect(md.stdout).toContain('- Covers: plan osc-demo');
    expect(md.stdout).toContain('- First-pass yield: 66.7 % (4 of 6 boards');
    const tableRows = md.stdout.split('\n').filter((l) => /^\| (osc|rails)\./.test(l));
    expect(tableRows[0]).toMatch(/^\| osc\.freq \| 6 \| 5 \| 0 \| 1 \|/);
    expect(md.stdout).toMatch(/- PB-0006 — osc\.freq = 3\.902 kHz \(outside band/);
  });

  test('a missing or unknown --format is a usage error (exit 2 through main) naming the choices', async () => {
    await expect(report(['--batch', '--log', t.dir])).rejects.toThrow(UsageError);
    await expect(report(['--batch', '--log', t.dir])).rejects.toThrow(/--format is needed: md .* csv/);
    await expect(report(['--batch', '--format', 'pdf', '--log', t.dir])).rejects.toThrow('--format "pdf" is not known; use md or csv');
  });
});
