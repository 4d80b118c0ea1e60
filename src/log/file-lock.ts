import { randomBytes } from 'node:crypto';
import { closeSync, linkSync, openSync, readFileSync, renameSync, statSync, unlinkSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { errorCode, LogLockError } from './errors.js';

export interface LockOptions {
  /** Give up after waiting this long, ms. @default 30000 */
  readonly waitMs?: number;
  /** A lock older than this is stale even if its process seems alive (pid reused after a reboot, another host), ms. @default 120000 */
  readonly staleMs?: number;
  /**
   * Told once, as soon as the wait is worth a word: at once when the holder is
   * on another host (its lock cannot be judged stale from here), else after 1 s.
   * Gets the holder in words ("process 812 on bench-2 since 2026-…").
   */
  readonly onWait?: (holder: string) => void;
}

interface Holder {
  readonly pid: number;
  readonly host: string;
  readonly nonce: string;
  readonly at: string;
}

// Locks this process holds right now, by nonce: a lock file that names our pid
// but none of these was left by an earlier process that had the same pid.
const held = new Set<string>();

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return errorCode(error) === 'EPERM';
  }
}

function readLock(path: string): { text: string; holder: Holder | null; mtimeMs: number } | null {
  try {
    const text = readFileSync(path, 'utf8');
    const { mtimeMs } = statSync(path);
    let holder: Holder | null = null;
    try {
      const data = JSON.parse(text) as Partial<Holder>;
      if (typeof data.pid === 'number' && typeof data.host === 'string' && typeof data.nonce === 'string') holder = data as Holder;
    } catch {
      holder = null; // half-written by a process that died between create and write
    }
    return { text, holder, mtimeMs };
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}

function isStale(lock: { holder: Holder | null; mtimeMs: number }, staleMs: number): boolean {
  const age = Date.now() - lock.mtimeMs;
  const { holder } = lock;
  if (!holder) return age > 2000;
  if (age > staleMs) return true;
  if (holder.host !== hostname()) return false;
  if (holder.pid === process.pid) return !held.has(holder.nonce);
  return !isAlive(holder.pid);
}

/**
 * Remove a stale lock without removing a fresh one that replaced it in the
 * meantime: move it aside, and if what was moved is not the lock judged stale,
 * put it back.
 */
function breakLock(path: string, staleText: string): void {
  const aside = `${path}.${randomBytes(4).toString('hex')}.stale`;
  try {
    renameSync(path, aside);
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return;
    throw error;
  }
  const moved = readFileSync(aside, 'utf8');
  if (moved !== staleText) {
    try {
      linkSync(aside, path);
    } catch (error) {
      if (errorCode(error) !== 'EEXIST') throw error;
    }
  }
  unlinkSync(aside);
}

/**
 * Create the lock file with O_EXCL and write the holder into it. If the write
 * fails (a full disk), the empty file just made is removed again, so no 0-byte
 * lock is left for the next writer to wait on.
 */
function createLock(path: string, text: string): void {
  const fd = openSync(path, 'wx');
  try {
    writeSync(fd, text);
  } catch (error) {
    closeSync(fd);
    try {
      unlinkSync(path);
    } catch {
      // Already gone: the write's error is the one to report.
    }
    throw error;
  }
  closeSync(fd);
}

function holderWords(holder: Holder | null): string {
  return holder ? `process ${holder.pid} on ${holder.host === hostname() ? 'this machine' : `host ${holder.host}`} since ${holder.at}` : 'another process';
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

// Callers in this process queue here per lock file, so they wait for each other
// without polling the file system; only the queue's head competes with other processes.
const queues = new Map<string, Promise<unknown>>();

function inProcessTurn(path: string): { ready: Promise<unknown>; done: () => void } {
  const before = queues.get(path) ?? Promise.resolve();
  let done: () => void = () => {};
  const mine = new Promise<void>((resolve) => {
    done = resolve;
  });
  const tail = before.then(() => mine);
  queues.set(path, tail);
  return {
    ready: before,
    done: () => {
      done();
      if (queues.get(path) === tail) queues.delete(path);
    },
  };
}

/**
 * Run `fn` holding an exclusive lock on `target` (the file `<target>.lock`,
 * created with O_EXCL, naming pid, host and a nonce). Works across processes
 * and within one. A lock left by a killed process is taken over at once when
 * its pid is gone on this host, else after `staleMs`; a lock that stays busy
 * longer than `waitMs` is an error naming the holder and the remedy.
 */
export async function withFileLock<T>(target: string, fn: () => Promise<T>, options: LockOptions = {}): Promise<T> {
  const path = `${target}.lock`;
  const turn = inProcessTurn(path);
  await turn.ready;
  try {
    return await withLockFile(path, target, fn, options);
  } finally {
    turn.done();
  }
}

async function withLockFile<T>(path: string, target: string, fn: () => Promise<T>, options: LockOptions): Promise<T> {
  const waitMs = options.waitMs ?? 30_000;
  const staleMs = options.staleMs ?? 120_000;
  const me: Holder = { pid: process.pid, host: hostname(), nonce: randomBytes(8).toString('hex'), at: new Date().toISOString() };
  const text = JSON.stringify(me);
  const started = Date.now();
  const deadline = started + waitMs;
  let hasSaid = false;
  let pause = 1;
  for (;;) {
    held.add(me.nonce);
    try {
      createLock(path, text);
      break;
    } catch (error) {
      held.delete(me.nonce);
      if (errorCode(error) !== 'EEXIST') throw error;
    }
    const lock = readLock(path);
    if (lock === null) continue;
    if (isStale(lock, staleMs)) {
      breakLock(path, lock.text);
      continue;
    }
    if (!hasSaid && options.onWait && (lock.holder !== null && lock.holder.host !== hostname() ? true : Date.now() - started > 1000)) {
      hasSaid = true;
      options.onWait(holderWords(lock.holder));
    }
    if (Date.now() > deadline) {
      const who = holderWords(lock.holder);
      throw new LogLockError(
        target,
        `${target} is busy: its lock ${path} has been held by ${who}; if no probebook is running there, delete ${path} and try again`,
      );
    }
    await sleep(pause + Math.random() * pause);
    pause = Math.min(pause * 2, 8);
  }
  try {
    return await fn();
  } finally {
    held.delete(me.nonce);
    const lock = readLock(path);
    // Never delete a lock that is no longer ours (it was broken as stale and taken by another).
    if (lock?.text === text) unlinkSync(path);
  }
}
