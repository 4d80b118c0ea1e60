import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, utimesSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { LogLockError } from '../../src/log/errors.js';
import { withFileLock } from '../../src/log/file-lock.js';
import { tempDir } from './fixtures/temp-log.js';

const t = tempDir('lock');
afterAll(() => t.remove());

/** The pid of a process that has exited (and been reaped). */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

describe('withFileLock', () => {
  test('runs callers one at a time and removes its lock file', async () => {
    const target = join(t.dir, 'serial.json');
    let inside = 0;
    let most = 0;
    await Promise.all(
      Array.from({ length: 20 }, () =>
        withFileLock(target, async () => {
          inside++;
          most = Math.max(most, inside);
          await new Promise((r) => setTimeout(r, 1));
          inside--;
        }),
      ),
    );
    expect(most).toBe(1);
    expect(existsSync(`${target}.lock`)).toBe(false);
  });

  test('releases the lock when the work throws', async () => {
    const target = join(t.dir, 'throws.json');
    await expect(withFileLock(target, async () => Promise.reject(new Error('boom')))).rejects.toThrow('boom');
    expect(existsSync(`${target}.lock`)).toBe(false);
  });

  test('takes over at once a lock left by a process that is gone', async () => {
    const target = join(t.dir, 'dead.json');
    writeFileSync(`${target}.lock`, JSON.stringify({ pid: deadPid(), host: hostname(), nonce: 'left', at: new Date().toISOString() }));
    const started = Date.now();
    expect(await withFileLock(target, async () => 'got it', { waitMs: 5000 })).toBe('got it');
    expect(Date.now() - started).toBeLessThan(2000);
    expect(readdirSync(t.dir).filter((n) => n.startsWith('dead.json'))).toEqual([]);
  });

  test('waits for a live holder, then gives up with a message naming the holder and the remedy', async () => {
    const target = join(t.dir, 'busy.json');
    // A lock held by this test's parent process (alive) on this host.
    writeFileSync(`${target}.lock`, JSON.stringify({ pid: process.ppid, host: hostname(), nonce: 'busy', at: '2026-01-01T00:00:00.000Z' }));
    const error = await withFileLock(target, async () => 'never', { waitMs: 200 }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(LogLockError);
    expect((error as Error).message).toMatch(new RegExp(`held by process ${process.ppid} on .* since 2026-01-01.*delete .*busy\\.json\\.lock`));
    expect(existsSync(`${target}.lock`)).toBe(true);
  });

  test('a lock from another host is stale only when old', async () => {
    const target = join(t.dir, 'remote.json');
    writeFileSync(`${target}.lock`, JSON.stringify({ pid: 1, host: 'another-bench-pc', nonce: 'r', at: '2026-01-01T00:00:00.000Z' }));
    await expect(withFileLock(target, async () => 'x', { waitMs: 100 })).rejects.toThrow(LogLockError);
    const old = (Date.now() - 10 * 60_000) / 1000;
    utimesSync(`${target}.lock`, old, old);
    expect(await withFileLock(target, async () => 'taken', { waitMs: 1000, staleMs: 60_000 })).toBe('taken');
  });

  test('an empty lock file (a crash between create and write) is stale after 2 s, not before', async () => {
    const target = join(t.dir, 'empty.json');
    writeFileSync(`${target}.lock`, '');
    await expect(withFileLock(target, async () => 'x', { waitMs: 100 })).rejects.toThrow(LogLockError);
    const old = (Date.now() - 5000) / 1000;
    utimesSync(`${target}.lock`, old, old);
    expect(await withFileLock(target, async () => 'ok', { waitMs: 1000 })).toBe('ok');
  });
});
