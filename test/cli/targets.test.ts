import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { main } from '../../src/cli/main.js';
import { formatBand } from '../../src/cli/targets-table.js';

const dir = mkdtempSync(join(tmpdir(), 'probebook-targets-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Run the real CLI as a child process, as a technician would (through tsx, no build needed). */
function cli(args: readonly string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/bin.ts', ...args], {
    encoding: 'utf8',
    timeout: 60_000,
    env: { ...process.env, PROBEBOOK_CACHE: join(dir, 'cache') },
  });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Run in-process with captured output. */
async function run(args: readonly string[]): Promise<{ status: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const status = await main(args, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), env: { PROBEBOOK_CACHE: join(dir, 'cache') }, cwd: dir });
  return { status, stdout, stderr };
}

describe('probebook targets: bad input exits 2 with one line', () => {
  test('a plan with a JSON syntax error (child process)', () => {
    const file = join(dir, 'broken.plan.json');
    writeFileSync(file, '{\n  "plan": "x",\n  "title": "t",,\n}\n');
    const r = cli(['targets', file]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/^probebook: plan .*broken\.plan\.json, line 3, column 16: not valid JSON; expected /);
  });

  test('an unknown stage kind names the path and lists the kinds (child process)', () => {
    const file = join(dir, 'kind.plan.json');
    writeFileSync(
      file,
      JSON.stringify({ plan: 'k', title: 't', rails: [{ id: '+5V', nominal: '5 V', tol: '5%' }], stages: [{ id: 'x', kind: 'flux-capacitor' }] }),
    );
    const r = cli(['targets', file]);
    expect(r.status).toBe(2);
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('stages[0].kind: unknown stage kind "flux-capacitor"; the known kinds are');
    expect(r.stderr).toContain('"schmitt-integrator"');
    expect(r.stderr).not.toMatch(/\bat .*\.ts:\d+/);
  });

  test('a missing file, a relative path named as given', async () => {
    const r = await run(['targets', 'nowhere.plan.json']);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('probebook: plan nowhere.plan.json: no such file; give the path of a *.plan.json file\n');
  });

  test('bad options', async () => {
    expect((await run(['targets', 'x.plan.json', '--trials', 'lots'])).stderr).toContain('--trials takes a whole number from 100 to 10000000');
    expect((await run(['targets', 'x.plan.json', '--spread', 'gaussian'])).status).toBe(2);
    expect((await run(['targets'])).status).toBe(2);
    expect((await run(['targets', 'a', 'b'])).status).toBe(2);
  });
});

describe('probebook targets: options', () => {
  test('--help prints the usage and exits 0', async () => {
    const r = await run(['targets', '--help']);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('--spread');
  });

  test('--spread uniform and --seed change the statistical band, --log is accepted', async () => {
    const plan = join(dir, 'div.plan.json');
    writeFileSync(
      plan,
      JSON.stringify({
        plan: 'div',
        title: 'divider (invented values)',
        rails: [{ id: '+12V', nominal: '12 V', tol: '1%' }],
        idleCurrent: { max: '5 mA' },
        stages: [{ id: 'ref', kind: 'divider', from: '+12V', parts: { Rtop: '10k 1%', Rbottom: '10k 1%' } }],
      }),
    );
    const stat = async (...extra: string[]) => {
      const r = await run(['targets', 'div.plan.json', '--json', '--trials', '4000', '--log', dir, ...extra]);
      expect(r.status).toBe(0);
      const json = JSON.parse(r.stdout) as { targets: { check: string; stat: { min: number; max: number }; worst: { min: number; max: number } }[] };
      return json.targets.find((t) => t.check === 'ref.out.dc');
    };
    const normal = await stat();
    const uniform = await stat('--spread', 'uniform');
    const seeded = await stat('--seed', '99');
    // Uniform parts spread wider than normal ones with tolerance = 3σ; the worst case does not depend on the spread.
    expect((uniform?.stat.max ?? 0) - (uniform?.stat.min ?? 0)).toBeGreaterThan((normal?.stat.max ?? 0) - (normal?.stat.min ?? 0));
    expect(uniform?.worst).toEqual(normal?.worst);
    expect(seeded?.stat).not.toEqual(normal?.stat);
    // Closed form: 12 V · 1.01 · 10.1k / (9.9k + 10.1k).
    expect(normal?.worst.max).toBeCloseTo((12.12 * 10_100) / 20_000, 10);
  });
});

describe('band formatting', () => {
  test('one prefix for both ends, one-sided bands, fractions as percent', () => {
    expect(formatBand(5.8806, 6.1206, 'V')).toBe('5.881 … 6.121 V');
    expect(formatBand(2124, 2672, 'Hz')).toBe('2.124 … 2.672 kHz');
    expect(formatBand(100, Infinity, 'Ω')).toBe('≥ 100 Ω');
    expect(formatBand(0.0206, 0.0262, '1')).toBe('2.06 … 2.62 %');
    expect(formatBand(-12.24, -11.76, 'V')).toBe('-12.24 … -11.76 V');
    expect(formatBand(Number.NaN, 1, 'V')).toBe('—');
  });
});
