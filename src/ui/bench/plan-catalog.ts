import { defaultSeed, defaultTrials } from '../../analysis/targets.js';
import type { TargetSet } from '../../analysis/types.js';
import type { TargetsCache } from '../../log/targets-cache.js';
import type { BenchLog, BoardSummary, LogIndex } from '../../log/types.js';
import { loadPlanText } from '../../plan/load.js';
import type { Plan } from '../../plan/types.js';
import { memoryTargetsCache } from '../batch/plan-bands.js';
import { type Progress, targetsOffThread } from './targets-off-thread.js';

/** Who hears a running computation's progress, and the last progress said (for a listener that joins late). */
interface Heard {
  readonly listeners: Set<Progress>;
  last: [number, number] | null;
}

/** A plan the technician may pick for a new board. */
export interface PlanChoice {
  readonly plan: Plan;
  /** `file`: given with `--plan`; `log`: a snapshot some board's run used. */
  readonly origin: 'file' | 'log';
  /** How many boards in the log last ran it. */
  readonly boards: number;
}

export interface TargetOptions {
  /** Monte Carlo trials. @default defaultTrials (as `probebook targets`) */
  readonly trials?: number;
  /** @default defaultSeed (as `probebook targets`) */
  readonly seed?: number;
  /** Compute in a worker thread so the screen keeps drawing. @default true */
  readonly offThread?: boolean;
  /** The one targets cache (`src/log/targets-cache.ts`); the TUI passes the user's cache folder. @default in memory only */
  readonly targetsCache?: TargetsCache;
}

/**
 * The plans the app can open: the files given with `--plan` and the exact
 * snapshots in the log, each loaded once and its targets computed once.
 */
export class PlanCatalog {
  private readonly plans = new Map<string, Plan>();
  /** Targets being computed, by plan hash: the job, who hears its progress, and the last progress said. */
  private readonly pending = new Map<string, { readonly job: Promise<TargetSet>; readonly heard: Heard }>();
  /** Where every screen gets its targets: the same cache the commands use. */
  readonly targetsCache: TargetsCache;
  /** Snapshots that could not be loaded, with the reason, by hash. */
  readonly broken = new Map<string, string>();

  private readonly files: Plan[];

  constructor(
    private readonly log: BenchLog,
    filePlans: readonly Plan[],
    private readonly options: TargetOptions = {},
  ) {
    this.files = [...filePlans];
    for (const plan of filePlans) this.plans.set(plan.hash, plan);
    this.targetsCache = options.targetsCache ?? memoryTargetsCache();
  }

  /** The plans given with `--plan`, as they are now (an edit saved from the plan editor takes its file's place). */
  get filePlans(): readonly Plan[] {
    return this.files;
  }

  /** Where a plan came from: a `--plan` file, or a snapshot the log keeps. */
  originOf(plan: Plan): PlanChoice['origin'] {
    return this.files.includes(plan) ? 'file' : 'log';
  }

  /**
   * A plan saved from the plan editor, edited from `from`: it takes the place of
   * the file plan it was edited from (a file is one plan), or joins the files
   * (an edited snapshot saved as a new file). The old plan stays known by its
   * hash: runs made with it still open.
   */
  saved(next: Plan, from: Plan): void {
    this.plans.set(next.hash, next);
    const at = this.files.findIndex((p) => p === from || p.file === next.file);
    if (at >= 0) this.files[at] = next;
    else this.files.push(next);
  }

  /** The Monte Carlo settings every screen's targets use. */
  settings() {
    return { trials: this.options.trials ?? defaultTrials, seed: this.options.seed ?? defaultSeed };
  }

  /** A plan by its hash: a `--plan` file, else the log's snapshot; null when neither has it. */
  async byHash(hash: string): Promise<Plan | null> {
    const known = this.plans.get(hash);
    if (known) return known;
    if (this.broken.has(hash)) return null;
    const text = await this.log.readPlanSnapshot(hash);
    return text === null ? null : this.fromSnapshot(hash, text);
  }

  /** A plan by its hash, given the snapshot's text already read: loaded once, as `byHash` loads it; null when it does not load. */
  fromSnapshot(hash: string, text: string): Plan | null {
    const known = this.plans.get(hash);
    if (known) return known;
    if (this.broken.has(hash)) return null;
    try {
      const plan = loadPlanText(text, `log snapshot ${hash.slice(0, 8)}`);
      this.plans.set(hash, plan);
      return plan;
    } catch (error) {
      this.broken.set(hash, error instanceof Error ? error.message : String(error));
      return null;
    }
  }

  /**
   * The plan for a board's next run: the `--plan` file of the same plan id
   * (the current revision on the bench), else the snapshot its last run used.
   */
  async forBoard(board: Pick<BoardSummary, 'plan' | 'planHash'>): Promise<Plan | null> {
    const sameHash = this.filePlans.find((p) => p.hash === board.planHash);
    if (sameHash) return sameHash;
    const sameId = this.filePlans.find((p) => p.plan === board.plan);
    if (sameId) return sameId;
    return board.planHash ? this.byHash(board.planHash) : null;
  }

  /** Plans to offer for a new board: the files first, then the log's other snapshots, most used first. */
  async choices(index: LogIndex): Promise<PlanChoice[]> {
    const counts = new Map<string, number>();
    for (const board of Object.values(index.boards)) {
      if (board.planHash) counts.set(board.planHash, (counts.get(board.planHash) ?? 0) + 1);
    }
    const out: PlanChoice[] = this.filePlans.map((plan) => ({ plan, origin: 'file', boards: counts.get(plan.hash) ?? 0 }));
    const fileHashes = new Set(this.filePlans.map((p) => p.hash));
    const others = [...counts.entries()].filter(([hash]) => !fileHashes.has(hash)).sort((a, b) => b[1] - a[1]);
    for (const [hash, boards] of others) {
      const plan = await this.byHash(hash);
      if (plan) out.push({ plan, origin: 'log', boards });
    }
    return out;
  }

  /** The targets of a plan (through the cache; the Monte Carlo is seeded, so always the same). */
  targets(plan: Plan): TargetSet {
    return this.targetsCache.forPlan(plan, this.settings());
  }

  /**
   * The targets of a plan without blocking the screen: computed in a worker
   * thread with progress, or on this thread when no worker can start.
   */
  targetsAsync(plan: Plan, onProgress?: Progress): Promise<TargetSet> {
    const { trials, seed } = this.settings();
    const key = this.targetsCache.keyOf(plan, { trials, seed });
    const ready = this.targetsCache.peek(key);
    if (ready) return Promise.resolve(ready);
    const running = this.pending.get(plan.hash);
    if (running) {
      // A screen left and opened again (or a second screen) hears the same job from where it is.
      if (onProgress) {
        running.heard.listeners.add(onProgress);
        if (running.heard.last) onProgress(...running.heard.last);
      }
      return running.job;
    }
    const heard: Heard = { listeners: new Set(onProgress ? [onProgress] : []), last: null };
    const tell: Progress = (done, total) => {
      heard.last = [done, total];
      for (const listener of heard.listeners) listener(done, total);
    };
    const off = this.options.offThread === false ? null : targetsOffThread(plan, trials, seed, tell);
    const job = (async () => {
      try {
        if (!off) return this.targets(plan);
        const set = await off;
        this.targetsCache.put(key, set);
        return set;
      } catch {
        // A worker that could not start or died: the same seeded numbers, here.
        return this.targets(plan);
      }
    })().finally(() => this.pending.delete(plan.hash));
    this.pending.set(plan.hash, { job, heard });
    return job;
  }

  /** Whether the targets of a plan are ready without computing. */
  hasTargets(plan: Plan): boolean {
    return this.targetsCache.peek(this.targetsCache.keyOf(plan, this.settings())) !== null;
  }
}
