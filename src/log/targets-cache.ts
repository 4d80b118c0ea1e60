import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, renameSync, statSync, unlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { TargetSet } from '../analysis/types.js';
import { loadPlanText } from '../plan/load.js';
import type { Plan } from '../plan/types.js';
import { buildId } from './build-id.js';
import { errorCode } from './errors.js';

/** What a target set depends on: the plan's exact text, the models, and the engine's settings. */
export interface TargetsKey {
  /** sha256 (hex) of the plan's exact text (`Plan.hash`). */
  readonly plan: string;
  /** The models' id (`buildId()`). */
  readonly build: string;
  readonly trials: number;
  readonly seed: number;
  readonly distribution: string;
}

/** The engine settings a caller asks for; the cache adds the plan and the build. */
export interface TargetsSettings {
  readonly trials: number;
  readonly seed: number;
  /** @default 'normal' */
  readonly distribution?: 'normal' | 'uniform';
  /** Progress of a computation the cache could not avoid. */
  readonly onProgress?: (done: number, total: number) => void;
}

/** The target engine (`computeTargets`), handed in: the store layer only knows its types. */
export type ComputeTargets = (plan: Plan, settings: TargetsSettings) => TargetSet;

export interface TargetsCacheOptions {
  /** The folder of the cache files; null keeps targets in memory only. */
  readonly dir: string | null;
  readonly compute: ComputeTargets;
  /** @default buildId() */
  readonly build?: string;
  /** Files kept at most; the least recently used go first. @default 200 */
  readonly maxEntries?: number;
  /** Bytes kept at most over all files. @default 64 MiB */
  readonly maxBytes?: number;
  /** Hears each problem once (a damaged or edited entry, a folder that cannot be written). */
  readonly onNotice?: (message: string) => void;
}

/** Target sets kept in memory by one cache object (a screen revisits a few plans, not hundreds). */
const memoryEntries = 32;
const format = 'probebook-targets';
const formatVersion = 1;

// JSON has no ±Infinity or NaN (open band sides, a missing nominal): they are
// written as {"$number": "Infinity"} so no ordinary string is ever mistaken for one.
const encode = (_key: string, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? { $number: String(v) } : v);
const decode = (_key: string, v: unknown) => {
  if (v !== null && typeof v === 'object' && !Array.isArray(v)) {
    const keys = Object.keys(v);
    const n = (v as { $number?: unknown }).$number;
    if (keys.length === 1 && (n === 'Infinity' || n === '-Infinity' || n === 'NaN')) return Number(n);
  }
  return v;
};

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

/** The text an entry's hash covers: its key and its content, exactly as written. */
const sealed = (key: TargetsKey, set: TargetSet) => JSON.stringify({ key, set }, encode);

function sameKey(a: TargetsKey, b: unknown): boolean {
  const k = b as Partial<TargetsKey> | null;
  return !!k && k.plan === a.plan && k.build === a.build && k.trials === a.trials && k.seed === a.seed && k.distribution === a.distribution;
}

function isTargetSet(v: unknown): v is TargetSet {
  const s = v as Partial<TargetSet> | null;
  return !!s && typeof s.plan === 'string' && Array.isArray(s.targets) && Array.isArray(s.warnings);
}

/**
 * The one cache of computed targets, in the store layer: every command and
 * screen asks it before running the Monte Carlo. An entry is keyed by the
 * plan's content hash, the models' build id, trials, seed and spread, and
 * carries a sha256 of its own key and content; an entry that does not match
 * (edited, damaged, another key under the same name) is recomputed, said once,
 * and written again. Writes go to a temporary file renamed into place, so
 * concurrent writers never leave half a file, and the folder is kept below
 * `maxEntries` files and `maxBytes` bytes, least recently used out first.
 * Everything in the folder may be deleted at any time.
 */
export class TargetsCache {
  private readonly memory = new Map<string, TargetSet>();
  private readonly said = new Set<string>();
  readonly dir: string | null;
  readonly build: string;

  constructor(private readonly options: TargetsCacheOptions) {
    this.dir = options.dir;
    this.build = options.build ?? buildId();
  }

  /** The key of a plan's targets under these settings. */
  keyOf(plan: Pick<Plan, 'hash'>, settings: Pick<TargetsSettings, 'trials' | 'seed' | 'distribution'>): TargetsKey {
    return { plan: plan.hash, build: this.build, trials: settings.trials, seed: settings.seed, distribution: settings.distribution ?? 'normal' };
  }

  /** The targets of a loaded plan: from memory, else the folder, else computed and saved. */
  forPlan(plan: Plan, settings: TargetsSettings): TargetSet {
    const key = this.keyOf(plan, settings);
    const known = this.peek(key);
    if (known) return known;
    const set = this.options.compute(plan, settings);
    this.put(key, set);
    return set;
  }

  /** The targets of a plan snapshot's exact text (loaded only when they must be computed). */
  forText(text: string, hash: string, label: string, settings: TargetsSettings): TargetSet {
    const key = this.keyOf({ hash }, settings);
    const known = this.peek(key);
    if (known) return known;
    const set = this.options.compute(loadPlanText(text, label), settings);
    this.put(key, set);
    return set;
  }

  /** A cached set, or null: nothing is computed. */
  peek(key: TargetsKey): TargetSet | null {
    const name = this.nameOf(key);
    const inMemory = this.memory.get(name);
    if (inMemory) {
      this.remember(name, inMemory);
      return inMemory;
    }
    const fromDisk = this.read(name, key);
    if (fromDisk) this.remember(name, fromDisk);
    return fromDisk;
  }

  /** Keep a computed set, in memory and in the folder. */
  put(key: TargetsKey, set: TargetSet): void {
    const name = this.nameOf(key);
    this.remember(name, set);
    this.write(name, key, set);
  }

  /** The file name of a key: its hash, so any key is a safe name. */
  private nameOf(key: TargetsKey): string {
    return `targets-${sha256(JSON.stringify(key)).slice(0, 32)}.json`;
  }

  private remember(name: string, set: TargetSet): void {
    this.memory.delete(name);
    this.memory.set(name, set);
    // Bounded: the least recently used set leaves first.
    while (this.memory.size > memoryEntries) {
      const oldest = this.memory.keys().next().value;
      if (oldest === undefined) break;
      this.memory.delete(oldest);
    }
  }

  private notice(message: string): void {
    if (this.said.has(message)) return;
    this.said.add(message);
    this.options.onNotice?.(message);
  }

  private read(name: string, key: TargetsKey): TargetSet | null {
    if (!this.dir) return null;
    const file = join(this.dir, name);
    let text: string;
    try {
      text = readFileSync(file, 'utf8');
    } catch (error) {
      if (errorCode(error) !== 'ENOENT')
        this.notice(`targets cache ${file} could not be read (${errorCode(error) ?? (error as Error).message}); the targets are computed again`);
      return null;
    }
    let entry: { format?: unknown; version?: unknown; key?: unknown; set?: unknown; sha256?: unknown };
    try {
      entry = JSON.parse(text, decode) as typeof entry;
    } catch {
      entry = {};
    }
    const isOurs = entry.format === format && entry.version === formatVersion && sameKey(key, entry.key) && isTargetSet(entry.set);
    if (!isOurs || entry.sha256 !== sha256(sealed(key, entry.set as TargetSet))) {
      this.notice(`targets cache ${file} does not match its own checksum (edited or damaged); the targets are computed again and the entry rewritten`);
      return null;
    }
    try {
      // Touch it: eviction removes the least recently used entries.
      const now = new Date();
      utimesSync(file, now, now);
    } catch {
      // A read-only cache still serves its entries.
    }
    return entry.set as TargetSet;
  }

  private write(name: string, key: TargetsKey, set: TargetSet): void {
    if (!this.dir) return;
    const file = join(this.dir, name);
    const tmp = `${file}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`;
    try {
      mkdirSync(this.dir, { recursive: true });
      const body = sealed(key, set);
      const text = JSON.stringify({ format, version: formatVersion, key, set, sha256: sha256(body) }, encode);
      writeFileSync(tmp, `${text}\n`);
      // Rename so a reader or a concurrent writer never sees half a file.
      renameSync(tmp, file);
    } catch (error) {
      try {
        unlinkSync(tmp);
      } catch {
        // Nothing was written.
      }
      this.notice(`targets cache not saved in ${this.dir} (${errorCode(error) ?? (error as Error).message}); the targets will be computed again next time`);
      return;
    }
    this.evict(file);
  }

  /** Keep the folder within its bounds (never evicting `kept`, just written); leftovers of killed writers (old .tmp files) go too. */
  private evict(kept: string): void {
    const dir = this.dir;
    if (!dir) return;
    const maxEntries = this.options.maxEntries ?? 200;
    const maxBytes = this.options.maxBytes ?? 64 * 1024 * 1024;
    let names: string[];
    try {
      names = readdirSync(dir).filter((n) => n.startsWith('targets-'));
    } catch {
      return;
    }
    const entries: { path: string; size: number; used: number }[] = [];
    const hourAgo = Date.now() - 3_600_000;
    let keptBytes = 0;
    for (const n of names) {
      const path = join(dir, n);
      try {
        const st = statSync(path);
        if (n.endsWith('.tmp')) {
          if (st.mtimeMs < hourAgo) unlinkSync(path);
        } else if (n.endsWith('.json') && path !== kept) entries.push({ path, size: st.size, used: st.mtimeMs });
        else if (path === kept) {
          keptBytes = st.size;
        }
      } catch {
        // Gone already: another process evicted it.
      }
    }
    entries.sort((a, b) => a.used - b.used);
    let count = entries.length + 1;
    let bytes = entries.reduce((sum, e) => sum + e.size, keptBytes);
    for (const e of entries) {
      if (count <= maxEntries && bytes <= maxBytes) break;
      try {
        unlinkSync(e.path);
      } catch {
        // Another process got there first.
      }
      count--;
      bytes -= e.size;
    }
  }
}
