import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';

const root = join(import.meta.dirname, '..', '..');
const demo = join(root, 'demo', 'captures');
const dir = mkdtempSync(join(tmpdir(), 'probebook-demo-captures-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The real command through its entry point, as a technician runs it. */
function probebook(...args: string[]): { status: number; stdout: string; stderr: string } {
  try {
    const stdout = execFileSync(process.execPath, ['--import', 'tsx', join(root, 'src', 'cli', 'bin.ts'), ...args], {
      cwd: root,
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    return { status: 0, stdout, stderr: '' };
  } catch (error) {
    const e = error as { status: number; stdout: string; stderr: string };
    return { status: e.status, stdout: e.stdout, stderr: e.stderr };
  }
}

describe('demo captures', () => {
  test('are exactly what demo/make-captures.ts writes (never edited by hand)', () => {
    execFileSync(process.execPath, ['--import', 'tsx', join(root, 'demo', 'make-captures.ts'), dir], { cwd: root, stdio: 'ignore' });
    const names = readdirSync(demo).sort();
    expect(readdirSync(dir).sort()).toEqual(names);
    for (const name of names) expect(readFileSync(join(dir, name)).equals(readFileSync(join(demo, name))), name).toBe(true);
    // Small enough to ship: a few hundred kB at most.
    const total = names.reduce((s, n) => s + readFileSync(join(demo, n)).length, 0);
    expect(total).toBeLessThan(400_000);
  });

  test('each shows what its scenario says (values invented in the script)', () => {
    const json = (...args: string[]) => JSON.parse(probebook('analyze', ...args, '--json').stdout) as Record<string, unknown>;
    expect(json('demo/captures/exciter-sine.csv')).toMatchObject({ shape: 'sine', clipped: false, notch: false });
    expect(json('demo/captures/driver-clipped.csv')).toMatchObject({ clipped: true, notch: false });
    expect(json('demo/captures/driver-notch.tsv')).toMatchObject({ notch: true, clipped: false });
    expect(json('demo/captures/osc-square-triangle.csv')).toMatchObject({ shape: 'square' });
    expect(json('demo/captures/osc-interface.wav', '--scale', '5')).toMatchObject({ shape: 'triangle' });
    // The clip level in the script is ±10.2 V: Vpp within noise (σ = 10 mV).
    expect(Math.abs((json('demo/captures/driver-clipped.csv').vpp as number) - 20.4)).toBeLessThan(0.08);
  });

  test('a bad file through the real entry point: one line on stderr, exit 2', () => {
    const r = probebook('analyze', 'demo/captures/README.md');
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/^probebook: demo\/captures\/README.md: no rows of numbers/);
  });
});
