import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';

// The shipped command: the bundle (scripts/build.mjs, built here into a folder of its own)
// with its samples worker beside it, as a technician runs it.
const dir = mkdtempSync(join(tmpdir(), 'probebook-bundle-'));
const out = join(dir, 'dist');
beforeAll(() => {
  const r = spawnSync(process.execPath, ['scripts/build.mjs'], { encoding: 'utf8', env: { ...process.env, PROBEBOOK_BUILD_DIR: out }, timeout: 120_000 });
  if (r.status !== 0) throw new Error(`the build failed: ${r.stderr}`);
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function targets(threads: string): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(out, 'probebook.js'), 'targets', 'demo/exciter.plan.json', '--json', '--trials', '4000'], {
    encoding: 'utf8',
    timeout: 120_000,
    env: { ...process.env, PROBEBOOK_CACHE: join(dir, `cache-${threads}`), PROBEBOOK_THREADS: threads },
  });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('targets from the bundle, on one thread and with its samples worker', () => {
  test('the build puts the worker beside the command', () => {
    expect(existsSync(join(out, 'samples-worker.js'))).toBe(true);
  });

  test('the same JSON either way (same seeded samples), nothing on stderr', () => {
    const one = targets('1');
    const two = targets('2');
    expect(one.status).toBe(0);
    expect(two.status).toBe(0);
    expect(one.stderr).toBe('');
    expect(two.stderr).toBe('');
    expect(two.stdout).toBe(one.stdout);
    expect(JSON.parse(one.stdout).targets.length).toBeGreaterThan(20);
  }, 120_000);
});
