// The durable write's promise (DESIGN §6: a reading is durable once the user is
// told it was saved) rests on fsync calls that a killed process cannot show: the
// page cache keeps unflushed data, so the file reads back whole anyway. Only a
// spy on the file-system layer sees whether the data and the rename were
// flushed, and in which order (write, fsync the file, rename, fsync the folder:
// the usual crash-safe replace on POSIX file systems, common practice, no source).
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, test, vi } from 'vitest';

const calls: { op: string; arg: unknown }[] = [];
const fdPaths = new Map<number, string>();

vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  const spied = {
    ...fs,
    openSync: (path: string, ...rest: unknown[]) => {
      const fd = (fs.openSync as (...a: unknown[]) => number)(path, ...rest);
      fdPaths.set(fd, path);
      return fd;
    },
    writeSync: (fd: number, ...rest: unknown[]) => {
      calls.push({ op: 'write', arg: fdPaths.get(fd) });
      return (fs.writeSync as (...a: unknown[]) => number)(fd, ...rest);
    },
    fsyncSync: (fd: number) => {
      calls.push({ op: 'fsync', arg: fdPaths.get(fd) });
      return fs.fsyncSync(fd);
    },
    renameSync: (from: string, to: string) => {
      calls.push({ op: 'rename', arg: `${from} -> ${to}` });
      return fs.renameSync(from, to);
    },
  };
  return { ...spied, default: spied };
});

const { DurableTextFile } = await import('../../src/log/durable-text-file.js');

afterEach(() => {
  calls.length = 0;
});

describe('DurableTextFile.write flushes before it resolves', () => {
  test('data written, the temporary file fsynced, renamed over the file, then the folder fsynced', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'probebook-durable-'));
    const file = join(dir, 'board.json');
    await new DurableTextFile(file).write('{"a":1}\n');
    expect(readFileSync(file, 'utf8')).toBe('{"a":1}\n');
    const ops = calls.map((c) => c.op);
    expect(ops).toEqual(['write', 'fsync', 'rename', 'fsync']);
    const tmp = calls[0]?.arg as string;
    expect(tmp.startsWith(`${file}.`)).toBe(true);
    // The fsync before the rename is of the temporary file's own descriptor …
    expect(calls[1]?.arg).toBe(tmp);
    expect(calls[2]?.arg).toBe(`${tmp} -> ${file}`);
    // … and the one after it of the folder that holds the new name.
    expect(calls[3]?.arg).toBe(dir);
  });

  test('with a backup kept, the old version is set aside and everything still flushed in that order', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'probebook-durable-'));
    const file = join(dir, 'board.json');
    const adapter = new DurableTextFile(file, { keepBackup: true });
    await adapter.write('first\n');
    calls.length = 0;
    await adapter.write('second\n');
    expect(readFileSync(file, 'utf8')).toBe('second\n');
    expect(readFileSync(`${file}.bak`, 'utf8')).toBe('first\n');
    const ops = calls.map((c) => c.op);
    expect(ops.slice(0, 2)).toEqual(['write', 'fsync']);
    expect(ops.at(-1)).toBe('fsync');
    expect(calls.at(-1)?.arg).toBe(dir);
    expect(calls.findIndex((c) => c.op === 'rename' && String(c.arg).endsWith(`-> ${file}`))).toBeGreaterThan(1);
  });
});
