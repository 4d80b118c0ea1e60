import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import { afterAll, describe, expect, test } from 'vitest';
import { csvRows, expandRefs, parseBom } from '../../src/plan/bom.js';
import { readBomValue, rolePath } from '../../src/plan/bom-reconcile.js';
import { cli } from '../log/fixtures/run-cli.js';

const dir = mkdtempSync(join(tmpdir(), 'probebook-bom-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('BOM CSV rows against csv-parse (RFC 4180 and the usual deviations)', () => {
  const files: [string, string, string][] = [
    ['comma, LF', ',', 'Designator,Value,Tolerance\nR1,10k,1%\nC7,22n,5%\n'],
    ['semicolon, CRLF, quoted', ';', '"Designator";"Value"\r\n"R1, R4-R6";"4k7"\r\n"C1";"100nF/50V"\r\n'],
    ['tab, quotes doubled', '\t', 'Ref\tComment\nD3\t"BZX ""5V6"""\nU1\tTL072\n'],
    ['byte-order mark, a newline inside quotes', ',', '\ufeffRef,Value\n"R2","a\nb"\nR3,1k\n'],
  ];
  test.each(files)('%s', (_name, delimiter, text) => {
    // csv-parse (an independent library) on the same bytes, with its BOM handling and relaxed quotes.
    const expected = (parse(text, { delimiter, bom: true, relax_column_count: true, skip_empty_lines: true }) as string[][]).map((r) => r.map((f) => f));
    expect(csvRows(text, delimiter).map((r) => r.fields)).toEqual(expected);
  });

  test('any table of fields written by csv quoting rules reads back the same (property, 200 cases)', () => {
    const field = fc.string({ maxLength: 12 }).map((s) => s.replace(/\r/g, ''));
    fc.assert(
      fc.property(fc.array(fc.array(field, { minLength: 2, maxLength: 4 }), { minLength: 1, maxLength: 6 }), fc.constantFrom(',', ';', '\t'), (table, d) => {
        const quote = (f: string) => `"${f.replace(/"/g, '""')}"`;
        const text = table.map((row) => row.map(quote).join(d)).join('\r\n');
        const expected = parse(text, { delimiter: d, relax_column_count: true, skip_empty_lines: true }) as string[][];
        const got = csvRows(text, d).map((r) => r.fields);
        // Both drop rows whose every field is empty in the same way only when the row is blank; compare non-blank rows.
        const nonBlank = (rows: string[][]) => rows.filter((r) => r.some((f) => f.trim() !== ''));
        expect(nonBlank(got)).toEqual(nonBlank(expected));
      }),
      { numRuns: 200 },
    );
  });
});

describe('reference designators', () => {
  test.each([
    ['R1', ['R1']],
    ['R1, R4-R6', ['R1', 'R4', 'R5', 'R6']],
    ['R1 R4', ['R1', 'R4']],
    ['C10-12', ['C10', 'C11', 'C12']],
    ['D3;D4', ['D3', 'D4']],
  ])('%j → %j', (field, refs) => {
    expect(expandRefs(field)).toEqual({ refs });
  });
  test('nonsense is named', () => {
    expect(expandRefs('R6-R4').problem).toMatch(/not a range/);
    expect(expandRefs('R1-C4').problem).toMatch(/not a range/);
    expect(expandRefs('10k').problem).toMatch(/not a reference designator/);
  });
});

describe('BOM values (IEC 60062 RKM codes and SI prefixes)', () => {
  test.each([
    ['10k', 'Ω', 10_000, null],
    ['10K', 'Ω', 10_000, null],
    ['4k7', 'Ω', 4_700, null],
    ['2R2', 'Ω', 2.2, null],
    ['4.7uF', 'F', 4.7e-6, null],
    ['4u7', 'F', 4.7e-6, null],
    ['100nF/50V', 'F', 100e-9, null],
    ['10K 1%', 'Ω', 10_000, 0.01],
    ['22n X7R', 'F', 22e-9, null],
  ] as const)('%j as %s', (text, unit, value, tol) => {
    const r = readBomValue(text, unit, null);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.value).toBeCloseTo(value, 15); // exact decimal scaling, IEC 60062 / SI prefixes
      expect(r.tol).toBe(tol);
    }
  });
  test('a tolerance column wins; DNP is unreadable', () => {
    const r = readBomValue('10k', 'Ω', '5%');
    expect(r.ok && r.tol).toBeCloseTo(0.05, 15);
    expect(readBomValue('DNP', 'Ω', null).ok).toBe(false);
  });
  test('role paths inside a stage', () => {
    expect(rolePath('Ct')).toEqual(['parts', 'Ct']);
    expect(rolePath('branches[1].R')).toEqual(['branches', 1, 'R']);
    expect(rolePath('clamp.vz')).toEqual(['clamp', 'vz']);
  });
});

describe('parseBom', () => {
  test('preamble lines, any header case, grouped refs, the tolerance column', () => {
    const bom = parseBom('Project: invented board\nRev A\n\nREFERENCE;Part Value;TOL\n"R1, R4-R5";4k7;1%\nC7;22n;\n');
    expect(bom.delimiter).toBe(';');
    expect(bom.entries.map((e) => [e.ref, e.value, e.tol, e.line])).toEqual([
      ['R1', '4k7', '1%', 5],
      ['R4', '4k7', '1%', 5],
      ['R5', '4k7', '1%', 5],
      ['C7', '22n', null, 6],
    ]);
  });
  test('named columns, and a clear line when none is found', () => {
    expect(parseBom('Part,Fitted\nR1,1k\n', { ref: 'part', value: 'fitted' }).entries).toHaveLength(1);
    expect(() => parseBom('a,b\n1,2\n')).toThrow(/no header with a reference and a value column/);
  });
});

describe('probebook plan bom and plan check', () => {
  const plan = {
    plan: 'bom-fixture',
    title: 'Invented divider board for the BOM tests',
    rails: [{ id: '+10V', nominal: '10 V', tol: '2%' }],
    stages: [
      {
        id: 'ref',
        kind: 'divider',
        from: '+10V',
        parts: { Rtop: '6k8 1%', Rbottom: '3k3 1%' },
        refs: { Rtop: 'R1', Rbottom: 'R2' },
        unknownKey: { kept: true },
      },
    ],
  };
  test('differences, one-sided refs, --write keeps the tolerance and every unknown key, backup kept', async () => {
    const planFile = join(dir, 'a.plan.json');
    writeFileSync(planFile, `${JSON.stringify(plan, null, 2)}\n`);
    const bomFile = join(dir, 'a.csv');
    writeFileSync(bomFile, 'Designator,Value\r\nR1,6.8k\r\nR2,3k9\r\nR7,10k\r\n');
    const dry = await cli(['plan', 'bom', planFile, bomFile, '--json']);
    expect(dry.status, dry.stderr).toBe(0);
    const report = JSON.parse(dry.stdout);
    expect(report.differences).toEqual([{ ref: 'R2', part: 'ref.Rbottom', plan: '3k3 1%', bom: '3k9 (3.9 kΩ)', write: '3k9 1%' }]);
    expect(report.same).toBe(1);
    expect(report.onlyInBom).toEqual([{ ref: 'R7', value: '10k', line: 4 }]);
    const before = readFileSync(planFile, 'utf8');
    const w = await cli(['plan', 'bom', planFile, bomFile, '--write']);
    expect(w.status, w.stderr).toBe(0);
    const after = JSON.parse(readFileSync(planFile, 'utf8'));
    expect(after.stages[0].parts).toEqual({ Rtop: '6k8 1%', Rbottom: '3k9 1%' });
    expect(after.stages[0].unknownKey).toEqual({ kept: true });
    expect(readFileSync(`${planFile}.bak`, 'utf8')).toBe(before);
    const check = await cli(['plan', 'check', planFile, '--json']);
    expect(JSON.parse(check.stdout)).toEqual({ plan: planFile, ok: true, problems: [] });
  });

  test('plan check lists every problem at once, with paths; exit 2', async () => {
    const bad = structuredClone(plan) as Record<string, unknown> & typeof plan;
    (bad.stages[0] as { parts: Record<string, string> }).parts.Rtop = '6k8 ohm 1% x';
    bad.stages.push({ id: 'amp', kind: 'inverting-amp', input: 'nowhere.out', parts: { Rin: '10k 1%', Rf: '22q' } } as never);
    bad.rails.push({ id: '-10V', nominal: '0 V', tol: '2%' });
    const file = join(dir, 'bad.plan.json');
    writeFileSync(file, JSON.stringify(bad));
    const r = await cli(['plan', 'check', file, '--json']);
    expect(r.status).toBe(2);
    const paths = JSON.parse(r.stdout).problems.map((p: { path: string }) => p.path);
    expect(paths).toEqual(expect.arrayContaining(['rails[1].nominal', 'stages[0].parts.Rtop', 'stages[1].parts.Rf']));
    const text = await cli(['plan', 'check', file]);
    expect(text.stdout).toMatch(/problems\n$/);
  });

  test('a BOM that would make the plan unloadable is refused and the plan left alone', async () => {
    const planFile = join(dir, 'c.plan.json');
    writeFileSync(planFile, JSON.stringify(plan));
    const bomFile = join(dir, 'c.csv');
    // A 0 Ω top resistor is read, but a divider refuses a zero part: the save is refused.
    writeFileSync(bomFile, 'Ref,Value\nR1,0R\n');
    const before = readFileSync(planFile, 'utf8');
    const r = await cli(['plan', 'bom', planFile, bomFile, '--write']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/the plan was not saved/);
    expect(readFileSync(planFile, 'utf8')).toBe(before);
  });
});
