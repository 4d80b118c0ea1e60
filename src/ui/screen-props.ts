import type { TargetSet } from '../analysis/types.js';
import type { TargetsCache } from '../log/targets-cache.js';
import type { BenchLog } from '../log/types.js';
import type { InstrumentSource } from '../bench/source.js';
import type { Plan } from '../plan/types.js';
import type { PlanCatalog } from './bench/plan-catalog.js';

/** Props every full screen gets from `app.tsx`. */
export interface ScreenProps {
  readonly log: BenchLog;
  /** Terminal size, updated on resize. */
  readonly width: number;
  readonly height: number;
  /** Whether this screen has the keyboard (false while a modal or help is open). @default true */
  readonly isActive?: boolean;
  /** Go back to the screen before (Esc). */
  readonly onExit: () => void;
  /**
   * Tell the app a text field has the keyboard (a rework note, a filter form),
   * so that `q` types a q there instead of quitting.
   */
  readonly onTypingChange?: (isTyping: boolean) => void;
}

export interface BringUpProps extends ScreenProps {
  /** The bench's instruments (`m` reads the selected check from one), or null when no instruments file is set up. @default null */
  readonly instruments?: InstrumentSource | null;
  readonly plan: Plan;
  readonly targets: TargetSet;
  readonly serial: string;
  readonly operator: string;
  /** Resume this run instead of starting a new one. */
  readonly resumeRun?: string;
  /** Tell the app a half-typed value exists, so `q` asks before quitting. */
  readonly onDirtyChange?: (isDirty: boolean) => void;
}

export interface HistoryProps extends ScreenProps {
  readonly serial: string;
  /** The app's plans: the bands come through it (its targets cache, its worker). @default a catalog of the log's snapshots over `targetsCache` */
  readonly catalog?: PlanCatalog;
  /** The targets cache, when no catalog is given. @default a cache in memory */
  readonly targetsCache?: TargetsCache;
}

export interface BatchProps extends ScreenProps {
  /** Open a board's history (from an outlier). */
  readonly onOpenBoard: (serial: string) => void;
  /** The app's plans: the bands come through it (its targets cache, its worker). @default a catalog of the log's snapshots over `targetsCache` */
  readonly catalog?: PlanCatalog;
  /** The targets cache, when no catalog is given. @default a cache in memory */
  readonly targetsCache?: TargetsCache;
}
