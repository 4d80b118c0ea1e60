import { spawn } from 'node:child_process';
import { chmodSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildSync } from 'esbuild';
import { describe, expect, test, vi } from 'vitest';
import { computeTargets } from '../../src/analysis/targets.js';
import type { TargetSet } from '../../src/analysis/types.js';
import { buildId, hashTree, unstampedId } from '../../src/log/build-id.js';
import { resolveCacheDir } from '../../src/log/cache-dir.js';
import { TargetsCache } from '../../src/log/targets-cache.js';
import { xdgBase } from '../../src/log/xdg.js';
import { planBandSource } from '../../src/ui/batch/plan-bands.js';
import { makeLog, runBoard } from '../review/real-log.js';

const tempDir = (tag: string) => mkdtempSync(join(tmpdir(), `probebook-${tag}-`));
const settings = { trials: 400, seed: 1 } as const;

/** A cache over `dir` whose engine is the real one, counting its calls. */
function counted(dir: string | null, extra: { build?: string; maxEntries?: number; maxBytes?: number } = {}) {
  const notices: string[] = [];
  const compute = vi.fn(computeTargets);
  const cache = new TargetsCache({ dir, compute, onNotice: (m) => notices.push(m), ...extra });
  return { cache, compute, notices };
}

const cacheFiles = (dir: string) => readdirSync(dir).filter((n) => n.endsWith('.json'));

describe('the targets cache (src/log/targets-cache.ts)', () => {
  test('computes once, then serves a fresh cache object from the folder, equal to the engine (±∞ and NaN kept)', async () => {
    const t = await makeLog();
    const dir = tempDir('cache');
    const first = counted(dir);
    const set = first.cache.forPlan(t.plan, settings);
    expect(first.compute).toHaveBeenCalledTimes(1);
    first.cache.forPlan(t.plan, settings);
    expect(first.compute).toHaveBeenCalledTimes(1);
    expect(cacheFiles(dir)).toHaveLength(1);

    const second = counted(dir);
    const again = second.cache.forPlan(t.plan, settings);
    expect(second.compute).not.toHaveBeenCalled();
    expect(second.notices).toEqual([]);
    expect(again).toEqual(
      JSON.parse(
        JSON.stringify(set, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v)),
        (_k, v) => (v === 'Infinity' ? Infinity : v === '-Infinity' ? -Infinity : v === 'NaN' ? Number.NaN : v),
      ),
    );
    expect(again.targets.find((x) => x.check === 'rails.+9V.to-ground')?.worst.max).toBe(Infinity);
    expect(again.targets.find((x) => x.check === 'osc.freq')?.worst).toEqual(set.targets.find((x) => x.check === 'osc.freq')?.worst);
    // The full target (phase, contributors, upstream) survives: `record` needs it for the next check.
    expect(again.targets.map((x) => x.phase)).toEqual(set.targets.map((x) => x.phase));
    expect(again.warnings).toEqual(set.warnings);

    // A NaN nominal and a string that merely looks like a number word stay what they were.
    const odd: TargetSet = { plan: 'Infinity', warnings: [], targets: [{ ...set.targets[0]!, nominal: Number.NaN, testPoint: 'Infinity' }] };
    const key = second.cache.keyOf({ hash: 'b'.repeat(64) }, settings);
    second.cache.put(key, odd);
    const read = counted(dir).cache.peek(key);
    expect(read?.targets[0]?.nominal).toBeNaN();
    expect(read?.targets[0]?.testPoint).toBe('Infinity');
    expect(read?.plan).toBe('Infinity');
  });

  test('the key: plan content, build, trials, seed and spread each make a new entry', async () => {
    const t = await makeLog();
    const dir = tempDir('cache');
    const { cache, compute } = counted(dir);
    cache.forPlan(t.plan, settings);
    cache.forPlan(t.plan, { ...settings, seed: 2 });
    cache.forPlan(t.plan, { ...settings, trials: 401 });
    cache.forPlan(t.plan, { ...settings, distribution: 'uniform' });
    expect(compute).toHaveBeenCalledTimes(4);
    const other = counted(dir, { build: 'another-build' });
    other.cache.forPlan(t.plan, settings);
    expect(other.compute).toHaveBeenCalledTimes(1);
    expect(cacheFiles(dir)).toHaveLength(5);
  });

  test('an edited entry is recomputed, said once, and written back whole (issue 10 item 6)', async () => {
    const t = await makeLog();
    const dir = tempDir('cache');
    const set = counted(dir).cache.forPlan(t.plan, settings);
    const [name] = cacheFiles(dir);
    const file = join(dir, name ?? '');
    const freq = set.targets.find((x) => x.check === 'osc.freq');
    // Someone widens a band by hand: the JSON still parses and keeps its shape.
    const edited = readFileSync(file, 'utf8').replace(JSON.stringify(freq?.worst.max), String((freq?.worst.max ?? 0) * 2));
    expect(edited).not.toBe(readFileSync(file, 'utf8'));
    writeFileSync(file, edited);

    const reader = counted(dir);
    const served = reader.cache.forPlan(t.plan, settings);
    expect(reader.compute).toHaveBeenCalledTimes(1);
    expect(served.targets.find((x) => x.check === 'osc.freq')?.worst).toEqual(freq?.worst);
    expect(reader.notices).toHaveLength(1);
    expect(reader.notices[0]).toMatch(/does not match its own checksum.*computed again/);
    // Said once: the next ask in the same process is quiet, and a new process reads the rewritten entry silently.
    reader.cache.forPlan(t.plan, settings);
    expect(reader.notices).toHaveLength(1);
    const later = counted(dir);
    later.cache.forPlan(t.plan, settings);
    expect(later.compute).not.toHaveBeenCalled();
    expect(later.notices).toEqual([]);
  });

  test('a cut-short file, garbage, or another key under the same name is recomputed', async () => {
    const t = await makeLog();
    const dir = tempDir('cache');
    const { cache } = counted(dir);
    cache.forPlan(t.plan, settings);
    const file = join(dir, cacheFiles(dir)[0] ?? '');
    const whole = readFileSync(file, 'utf8');
    for (const damaged of [whole.slice(0, 200), '{not json', '', whole.replace(/"seed":1/, '"seed":2')]) {
      writeFileSync(file, damaged);
      const reader = counted(dir);
      reader.cache.forPlan(t.plan, settings);
      expect(reader.compute).toHaveBeenCalledTimes(1);
      expect(reader.notices).toHaveLength(1);
    }
  });

  test('bounded: past maxEntries the least recently used entries leave', () => {
    const dir = tempDir('cache');
    const set: TargetSet = { plan: 'p', targets: [], warnings: [] };
    const cache = new TargetsCache({ dir, compute: () => set, build: 'b', maxEntries: 5 });
    const keys = Array.from({ length: 12 }, (_, seed) => cache.keyOf({ hash: 'c'.repeat(64) }, { trials: 100, seed }));
    for (const key of keys) cache.put(key, set);
    expect(cacheFiles(dir)).toHaveLength(5);
    const fresh = new TargetsCache({ dir, compute: () => set, build: 'b', maxEntries: 5 });
    expect(fresh.peek(keys[11]!)).not.toBeNull();
    expect(fresh.peek(keys[0]!)).toBeNull();
    // And by size: one entry of ~100 bytes over a 1-byte bound keeps only the newest.
    const tiny = new TargetsCache({ dir, compute: () => set, build: 'b', maxBytes: 1 });
    tiny.put(keys[3]!, set);
    expect(cacheFiles(dir)).toHaveLength(1);
  });

  test('safe under concurrent writers: 6 processes writing the same 25 keys leave only whole entries', async () => {
    const dir = tempDir('cache');
    const out = join(tempDir('child'), 'targets-cache-child.mjs');
    buildSync({
      entryPoints: [fileURLToPath(new URL('./fixtures/targets-cache-child.ts', import.meta.url))],
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      outfile: out,
      logLevel: 'error',
    });
    const runs = Array.from(
      { length: 6 },
      (_, i) =>
        new Promise<{ code: number | null; stderr: string }>((resolve) => {
          const child = spawn(process.execPath, [out, dir, `w${i}`, '25'], { stdio: ['ignore', 'ignore', 'pipe'] });
          let stderr = '';
          child.stderr.on('data', (d) => (stderr += d));
          child.on('exit', (code) => resolve({ code, stderr }));
        }),
    );
    for (const r of await Promise.all(runs)) expect(r).toEqual({ code: 0, stderr: '' });
    expect(cacheFiles(dir)).toHaveLength(25);
    expect(readdirSync(dir).filter((n) => n.endsWith('.tmp'))).toEqual([]);
    const reader = new TargetsCache({
      dir,
      build: 'concurrency',
      compute: () => ({ plan: 'recomputed', targets: [], warnings: [] }),
      onNotice: (m) => expect.fail(m),
    });
    for (let seed = 0; seed < 25; seed++) {
      const set = reader.peek(reader.keyOf({ hash: 'a'.repeat(64) }, { trials: 100, seed }));
      expect(set?.plan).toMatch(/^writer-w\d$/);
      expect(set?.targets[7]?.nominal).toBe(seed + 7);
    }
  });

  test('a folder it cannot write: the targets are still served, the problem said once', async () => {
    const t = await makeLog();
    const parent = tempDir('cache');
    mkdirSync(join(parent, 'ro'));
    chmodSync(join(parent, 'ro'), 0o500);
    const { cache, compute, notices } = counted(join(parent, 'ro', 'inner'));
    const set = cache.forPlan(t.plan, settings);
    expect(set.targets.length).toBeGreaterThan(0);
    expect(compute).toHaveBeenCalledTimes(1);
    // Root ignores the folder's mode: then the write simply works.
    if (process.getuid?.() !== 0) expect(notices).toEqual([expect.stringMatching(/^targets cache not saved in .*ro\/inner \(EACCES\)/)]);
    chmodSync(join(parent, 'ro'), 0o700);
  });

  test('planBandSource serves snapshot bands through the cache', async () => {
    const t = await makeLog();
    await runBoard(t, 'PB-0100', { 'osc.freq': 3520 });
    const dir = tempDir('cache');
    const first = counted(dir);
    const bands = await planBandSource(t.log, first.cache).get(t.plan.hash);
    expect(bands?.order).toEqual(t.targets.targets.map((x) => x.check));
    const second = counted(dir);
    const again = await planBandSource(t.log, second.cache).get(t.plan.hash);
    expect(second.compute).not.toHaveBeenCalled();
    expect(again?.bands.get('osc.freq')?.worst).toEqual(t.target('osc.freq').worst);
    expect(again?.bands.get('rails.+9V.to-ground')?.isLimit).toBe(true);
  });
});

describe('the build id and the folders', () => {
  test('from source, a hash of src/ and data/ that changes with any file', () => {
    expect(buildId()).toMatch(/^src-[0-9a-f]{16}$/);
    expect(buildId()).toBe(buildId());
    const root = tempDir('tree');
    mkdirSync(join(root, 'src'));
    mkdirSync(join(root, 'data'));
    writeFileSync(join(root, 'src', 'model.ts'), 'export const k = 1;\n');
    writeFileSync(join(root, 'data', 'table.json'), '[1]\n');
    const before = hashTree(root, ['src', 'data']);
    writeFileSync(join(root, 'data', 'table.json'), '[2]\n');
    expect(hashTree(root, ['src', 'data'])).not.toBe(before);
  });

  test("bundled without a stamp and away from the sources: the running file's hash, else a fresh id", () => {
    const dir = tempDir('bundle');
    const file = join(dir, 'chunk.js');
    writeFileSync(file, 'export const model = 1;\n');
    const first = unstampedId(file);
    expect(first).toMatch(/^file-[0-9a-f]{16}$/);
    writeFileSync(file, 'export const model = 2;\n');
    expect(unstampedId(file)).not.toBe(first);
    // A file that cannot be read: an id of its own, never one shared with another process.
    const missing = join(dir, 'gone.js');
    expect(unstampedId(missing)).toMatch(/^process-[0-9a-f]{16}$/);
    expect(unstampedId(missing)).not.toBe(unstampedId(missing));
    // In the checkout, the sources' hash.
    expect(unstampedId(fileURLToPath(new URL('../../src/log/build-id.ts', import.meta.url)))).toBe(buildId());
  });

  test('cache folder: --cache, then PROBEBOOK_CACHE, then an absolute XDG_CACHE_HOME (a relative one is ignored, XDG Base Directory Specification)', () => {
    expect(resolveCacheDir('/x/flag', { PROBEBOOK_CACHE: '/x/c' })).toBe('/x/flag');
    expect(resolveCacheDir(undefined, { PROBEBOOK_CACHE: '/x/c' })).toBe('/x/c');
    expect(resolveCacheDir(undefined, { XDG_CACHE_HOME: '/x/xdg' })).toBe('/x/xdg/probebook');
    expect(resolveCacheDir(undefined, { XDG_CACHE_HOME: 'relative/xdg' })).toMatch(/\/\.cache\/probebook$/);
    expect(resolveCacheDir(undefined, {})).toMatch(/\/\.cache\/probebook$/);
    expect(xdgBase({ XDG_CONFIG_HOME: 'cfg' }, 'XDG_CONFIG_HOME')).toMatch(/\/\.config$/);
    expect(xdgBase({ XDG_CONFIG_HOME: '/etc/cfg' }, 'XDG_CONFIG_HOME')).toBe('/etc/cfg');
    expect(xdgBase({ XDG_DATA_HOME: './data' }, 'XDG_DATA_HOME')).toMatch(/\/\.local\/share$/);
  });
});
