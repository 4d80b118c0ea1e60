import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { boardCsvField } from '../../src/cli/report.js';
import { openLog } from '../../src/log/store.js';
import type { BoardFile } from '../../src/log/types.js';
import { uncertaintyKey } from '../../src/units/unit.js';
import { biasPlan, cli } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

const t = tempDir('report');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir };
let board: BoardFile;

beforeAll(async () => {
  const readings: [string, string, string][] = [
    ['rails.+10V.to-ground', 'open', 'tess'],
    ['rails.-10V.to-ground', '2k2', 'tess'],
    ['rails.idle-current', '19,5 mA', 'tess'],
    ['rails.+10V.dc', '10.04', 'kim "KK" lee'],
    ['rails.-10V.dc', '-10.1', 'tess'],
    ['ref.out.dc', '3.40', 'tess'],
    ['ref.out.dc', '3.27', 'o,brien'],
  ];
  for (const [check, value, operator] of readings) {
    const r = await cli(['record', '--plan', biasPlan, '--board', 'P-001', '--check', check, '--value', value, '--operator', operator], env);
    expect(r.status, r.stderr).toBe(0);
  }
  const log = await openLog(t.dir);
  const b = await log.readBoard('P-001');
  await log.addRework('P-001', {
    run: b?.runs[0]?.id ?? null,
    part: 'ref.Rtop',
    from: '6k2',
    to: '6k8',
    note: 'swapped | mislabelled reel (invented)',
    operator: 'kim',
  });
  board = (await log.readBoard('P-001')) as BoardFile;
});

describe('probebook report SERIAL --format csv', () => {
  test('parsed by an independent RFC 4180 parser (csv-parse), it equals the log', async () => {
    const r = await cli(['report', 'P-001', '--format', 'csv'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.endsWith('\r\n')).toBe(true);
    const rows = parse(r.stdout, { columns: true, record_delimiter: '\r\n' }) as Record<string, string>[];
    expect(rows).toHaveLength(board.readings.length);
    rows.forEach((row, i) => {
      const reading = board.readings[i];
      expect(row).toMatchObject({
        serial: 'P-001',
        run: reading?.run,
        check: reading?.check,
        unit: reading ? uncertaintyKey(reading.unit) : '',
        raw: reading?.raw,
        verdict: reading?.verdict,
        at: reading?.at,
        operator: reading?.operator,
        plan_hash: reading?.planHash,
        reading_id: reading?.id,
      });
      // Every digit kept: the number reads back to the same double.
      expect(Number(row.value)).toBe(reading?.value);
    });
    expect(rows[0]?.value).toBe('Infinity');
    expect(rows[2]?.value).toBe('0.0195');
    expect(rows[5]?.test_point).toBe('TP4');
    // The divider's worst-case low corner of the invented bias plan, hand arithmetic: above 3.1 V.
    expect(Number(rows[5]?.worst_min)).toBeGreaterThan(3.1);
    // Divider formula Vout = V·Rb/(Rt+Rb) (any circuits handbook) at the fixture's low corner:
    // +10V at −2 %, Rtop 6k8 at +1 %, Rbottom 3k3 at −1 %; within 5 mV (toBeCloseTo 2 places), never narrower.
    const low = (10 * 0.98 * 3300 * 0.99) / (6800 * 1.01 + 3300 * 0.99);
    expect(Number(rows[5]?.worst_min)).toBeCloseTo(low, 2);
    expect(Number(rows[5]?.worst_min)).toBeLessThanOrEqual(low * (1 + 1e-9));
  });

  test('text that a spreadsheet would run as a formula is defused; numbers are not', () => {
    expect(boardCsvField('=HYPERLINK("x")', true)).toBe(`"'=HYPERLINK(""x"")"`);
    expect(boardCsvField('@SUM(A1)', true)).toBe("'@SUM(A1)");
    expect(boardCsvField('-10.05', true)).toBe('-10.05');
    expect(boardCsvField('+cmd', true)).toBe("'+cmd");
    expect(boardCsvField(Infinity)).toBe('Infinity');
  });
});

describe('probebook report SERIAL --format md', () => {
  test('a traveler with board, plan title and hash, runs, every reading with band and verdict, rework, cautions', async () => {
    const r = await cli(['report', 'P-001', '--format', 'md'], env);
    expect(r.status, r.stderr).toBe(0);
    const md = r.stdout;
    expect(md).toMatch(/^# Traveler: board P-001\n/);
    expect(md).toContain('Test fixture: bias reference board (invented values)');
    expect(md).toContain(board.runs[0]?.planHash);
    expect(md).toMatch(/Cautions: .*current-limited supply.*Local codes and licensed practice come first/);
    const section = md.slice(md.indexOf('## Readings'), md.indexOf('## Rework notes'));
    const rows = section.split('\n').filter((l) => /^\| \d+ \|/.test(l));
    expect(rows).toHaveLength(board.readings.length);
    board.readings.forEach((reading, i) => {
      const row = rows[i] ?? '';
      expect(row).toContain(`| ${reading.check} |`);
      expect(row).toContain(`\`${reading.raw}\``);
      expect(row).toMatch(new RegExp(`\\| (\\*\\*)?${reading.verdict}(\\*\\*)?( \\[\\d+\\])? \\|`));
    });
    expect(rows[5]).toMatch(/\| 3\.159 V … 3\.378 V \| 3\.267 V \| \+4\.06 % \| \*\*fail\*\* \|/);
    expect(md).toContain('| ref.Rtop | 6k2 | 6k8 | swapped \\| mislabelled reel (invented) | kim |');
    expect(md).toMatch(/Checked by: _+/);
  });

  test('md is the default; an unknown format or board is exit 2', async () => {
    expect((await cli(['report', 'P-001'], env)).stdout).toMatch(/^# Traveler/);
    const bad = await cli(['report', 'P-001', '--format', 'pdf'], env);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--format "pdf" is not known; use md .* or csv/);
    expect((await cli(['report', 'NOPE', '--format', 'csv'], env)).status).toBe(2);
  });

  test('report --batch is handed to the batch report', async () => {
    const r = await cli(['report', '--batch', '--format', 'csv'], env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.split('\r\n')[0]).toMatch(/^check,n,pass,marginal,fail/);
  });
});
