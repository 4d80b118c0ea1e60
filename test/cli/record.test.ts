import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, test } from 'vitest';
import { readValue } from '../../src/cli/record.js';
import { UsageError } from '../../src/cli/errors.js';
import type { Target } from '../../src/analysis/types.js';
import { openLog } from '../../src/log/store.js';
import { biasPlan, cli, cliProcess } from '../log/fixtures/run-cli.js';
import { tempDir } from '../log/fixtures/temp-log.js';

const t = tempDir('record');
afterAll(() => t.remove());
const env = { PROBEBOOK_LOG: t.dir, PROBEBOOK_OPERATOR: 'tess' };
const record = (board: string, check: string, value: string, extra: string[] = []) =>
  cli(['record', '--plan', biasPlan, '--board', board, '--check', check, '--value', value, ...extra], env);

// Worst-case band of ref.out.dc from the divider formula Vout = V·Rb/(Rt+Rb)
// (any circuits handbook), at the corners of the fixture's tolerance box:
// +10V rail ±2 %, Rtop 6k8 ±1 %, Rbottom 3k3 ±1 %.
const low = (10 * 0.98 * 3300 * 0.99) / (6800 * 1.01 + 3300 * 0.99);
const high = (10 * 1.02 * 3300 * 1.01) / (6800 * 0.99 + 3300 * 1.01);
const nominal = (10 * 3300) / (6800 + 3300);
// The fixture's meter: 0.5 % + 2 mV.
const u = (v: number) => 0.005 * Math.abs(v) + 0.002;

describe('probebook record', () => {
  test('--json prints the contract keys; the verdict follows the guard band (ILAC-G8 simple acceptance)', async () => {
    const r = await record('R-001', 'ref.out.dc', '3.28', ['--json']);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out.reading)).toEqual(['id', 'run', 'check', 'value', 'unit', 'raw', 'at', 'operator', 'verdict']);
    expect(out.reading).toMatchObject({ check: 'ref.out.dc', value: 3.28, unit: 'V', raw: '3.28', operator: 'tess', verdict: 'pass' });
    expect(out.verdict).toBe('pass');
    expect(out.next).toEqual({ check: expect.stringMatching(/^rails\./), why: expect.any(String) });
    // The band the verdict used is the closed-form worst case (toBeCloseTo(…, 2): within 5 mV, about 0.15 % of 3.3 V;
    // the engine may only widen it, by Monte Carlo extremes, never narrow it).
    expect(out.worst.min).toBeCloseTo(low, 2);
    expect(out.worst.max).toBeCloseTo(high, 2);
    expect(out.worst.min).toBeLessThanOrEqual(low * (1 + 1e-9));
    expect(out.worst.max).toBeGreaterThanOrEqual(high * (1 - 1e-9));
    // Deviation = (reading − nominal)/|nominal| (DESIGN §7 record --json), hand arithmetic.
    expect(out.deviation).toBeCloseTo((3.28 - nominal) / nominal, 9);
    // Stage reading before the safety checks: recorded, with a warning.
    expect(out.warnings.join(' ')).toMatch(/safety checks skipped: rails\.\+10V\.to-ground, rails\.-10V\.to-ground, rails\.idle-current/);
  });

  test('pass, marginal and fail at the band edge, from band and uncertainty computed here', async () => {
    const inside = high - u(high) - 0.005; // reading ± U inside
    const straddle = high; // reading − U inside, reading + U outside
    const outside = high + u(high) + 0.005; // reading ± U wholly above
    const verdicts = [];
    for (const v of [inside, straddle, outside]) verdicts.push(JSON.parse((await record('R-002', 'ref.out.dc', v.toFixed(4), ['--json'])).stdout).verdict);
    expect(verdicts).toEqual(['pass', 'marginal', 'fail']);
  });

  test('readable output: verdict, value, band, deviation in %, test point and the next check', async () => {
    const r = await record('R-003', 'ref.out.dc', '3.4');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^FAIL {2}ref\.out\.dc = 3\.4 V/);
    expect(r.stdout).toContain(`+${(((3.4 - nominal) / nominal) * 100).toFixed(2)} % from nominal`);
    expect(r.stdout).toContain('at TP4');
    expect(r.stdout).toMatch(/\nnext: rails\.\+10V\.to-ground — power off/);
  });

  test('negative readings as typed (--value -10.05 and --value=-10.05), OL as an open circuit', async () => {
    const a = JSON.parse((await record('R-004', 'rails.-10V.dc', '-10.05', ['--json'])).stdout);
    const b = JSON.parse((await cli(['record', '--plan', biasPlan, '--board', 'R-004', '--check', 'rails.-10V.dc', '--value=-10.05', '--json'], env)).stdout);
    expect([a.reading.value, b.reading.value]).toEqual([-10.05, -10.05]);
    const ol = JSON.parse((await record('R-004', 'rails.+10V.to-ground', 'OL', ['--json'])).stdout);
    expect(ol.verdict).toBe('pass');
    expect(ol.reading.value).toBeNull();
    expect((await openLog(t.dir).then((l) => l.readBoard('R-004')))?.readings.at(-1)?.value).toBe(Infinity);
  });

  test('a whole bring-up in safe order ends the run; the next reading starts a new one', async () => {
    const steps: [string, string][] = [
      ['rails.+10V.to-ground', '8k2'],
      ['rails.-10V.to-ground', 'OL'],
      ['rails.idle-current', '17 mA'],
      ['rails.+10V.dc', '10.02'],
      ['rails.-10V.dc', '-9.98'],
      ['ref.out.dc', '3.27'],
      ['neg.out.dc', '-4.06'],
    ];
    let last;
    for (const [check, value] of steps) {
      last = JSON.parse((await record('R-005', check, value, ['--json'])).stdout);
      expect(last.warnings, check).toEqual([]);
    }
    expect(last.next).toBeNull();
    expect(last.runEnded).toBe('passed');
    const log = await openLog(t.dir);
    expect((await log.readIndex()).boards['R-005']?.state).toBe('passed');
    const again = JSON.parse((await record('R-005', 'ref.out.dc', '3.27', ['--json'])).stdout);
    expect(again.reading.run).not.toBe(last.reading.run);
  });

  test('an idle current above the limit ends the run as power-off', async () => {
    await record('R-006', 'rails.+10V.to-ground', '9k1');
    await record('R-006', 'rails.-10V.to-ground', '9k1');
    const r = JSON.parse((await record('R-006', 'rails.idle-current', '80 mA', ['--json'])).stdout);
    expect(r.verdict).toBe('fail');
    expect(r.runEnded).toBe('power-off');
    expect(r.next.why).toMatch(/^power off/);
  });

  test.each([
    [['--board', 'a/b'], /path separator/],
    [['--board', '..'], /"\.\."/],
    [['--board', 'x\u0007y'], /control character/],
    [['--check', 'ref.out'], /no check "ref\.out" in plan .*close ones: ref\.out\.dc/],
    [['--value', '3.2x'], /check ref\.out\.dc: "3\.2x": "x" is not a unit or prefix/],
    [['--value', '3.2 A'], /is a current; expected a voltage/],
    [['--value', '3.2 5%'], /carries a tolerance/],
    [['--value', ''], /--value is needed/],
  ])('bad input %j: exit 2, one line, nothing written', async (change, pattern) => {
    const args = { '--board': 'R-BAD', '--check': 'ref.out.dc', '--value': '3.3' } as Record<string, string>;
    for (let i = 0; i < change.length; i += 2) args[change[i] as string] = change[i + 1] as string;
    const r = await cli(['record', '--plan', biasPlan, ...Object.entries(args).flat()], env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(pattern);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stdout).toBe('');
    expect(existsSync(join(t.dir, 'boards', 'R-BAD.json'))).toBe(false);
  });

  test('a damaged board file: exit 1 with the file and the remedy, bytes unchanged (real process)', async () => {
    await record('R-007', 'ref.out.dc', '3.3');
    await record('R-007', 'neg.out.dc', '-4.05');
    const path = join(t.dir, 'boards', 'R-007.json');
    const cut = readFileSync(path, 'utf8').slice(0, 200);
    writeFileSync(path, cut);
    const r = cliProcess(['record', '--plan', biasPlan, '--board', 'R-007', '--check', 'ref.out.dc', '--value', '3.3'], env);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^probebook: board file .*R-007\.json cannot be read: the JSON ends early at line \d+, column \d+.*cp '.*R-007\.json\.bak'/);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(readFileSync(path, 'utf8')).toBe(cut);
  });

  test('operator: --operator, else $PROBEBOOK_OPERATOR, else $USER, else unknown', async () => {
    const op = async (extra: string[], e: Record<string, string>) =>
      JSON.parse(
        (
          await cli(['record', '--plan', biasPlan, '--board', 'R-008', '--check', 'ref.out.dc', '--value', '3.3', '--json', ...extra], {
            PROBEBOOK_LOG: t.dir,
            ...e,
          })
        ).stdout,
      ).reading.operator;
    expect(await op(['--operator', 'kim'], { PROBEBOOK_OPERATOR: 'tess', USER: 'u' })).toBe('kim');
    expect(await op([], { PROBEBOOK_OPERATOR: 'tess', USER: 'u' })).toBe('tess');
    expect(await op([], { USER: 'u' })).toBe('u');
    expect(await op([], {})).toBe('unknown');
  });
});

describe('the reading parser (readValue)', () => {
  const volts = { check: 'x.dc', unit: 'V' } as Target;
  test('property: never crashes; a rejection is a UsageError with one line', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 24 }), (text) => {
        try {
          const v = readValue(text, volts);
          expect(Number.isNaN(v)).toBe(false);
        } catch (error) {
          expect(error).toBeInstanceOf(UsageError);
          expect((error as Error).message).toMatch(/^check x\.dc: .+; nothing was saved$/);
          expect((error as Error).message).not.toMatch(/\n/);
        }
      }),
      { numRuns: 1000, seed: 7 },
    );
  });

  test('property: a number with an SI prefix reads as mantissa × 10^exponent (BIPM SI prefixes)', () => {
    const prefixes: [string, number][] = [
      ['m', -3],
      ['u', -6],
      ['k', 3],
      ['', 0],
    ];
    fc.assert(
      fc.property(
        fc.integer({ min: -99999, max: 99999 }),
        fc.integer({ min: 0, max: 3 }),
        fc.constantFrom(...prefixes),
        (mantissa, decimals, [prefix, exp]) => {
          const text = `${(mantissa / 10 ** decimals).toFixed(decimals)} ${prefix}V`;
          // The number the property wrote, read back (decimal notation, no outside figure).
          expect(readValue(text, volts)).toBeCloseTo((mantissa / 10 ** decimals) * 10 ** exp, 12 - Math.max(0, exp));
        },
      ),
      { numRuns: 300, seed: 11 },
    );
  });
});
