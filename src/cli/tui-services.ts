import { existsSync } from 'node:fs';
import { instrumentsPath, loadInstruments } from '../bench/instruments-file.js';
import { BenchSession } from '../bench/session.js';
import { type InstrumentSource, sessionSource } from '../bench/source.js';
import type { BenchLog } from '../log/types.js';
import { loadPlanText } from '../plan/load.js';
import { PlanCatalog } from '../ui/bench/plan-catalog.js';
import type { PlanEditAccess } from '../ui/plan-editor/plan-edit-access.js';
import type { CommandIo } from './command.js';
import { planEditAccess } from './plan-draft-file.js';
import { targetsCacheFor } from './targets-cache.js';
import type { TuiArgs } from './tui.js';

/** What the screens behind the bench screen need: loaded after the bench screen's first frame. */
export interface TuiServices {
  readonly catalog: PlanCatalog;
  readonly instruments: InstrumentSource | null;
  /** How the plan screen's `e` opens and saves a plan in the editor. */
  readonly planEditing: PlanEditAccess;
}

/**
 * The bench's instruments for the bring-up screen's `m` key: the file named by
 * --instruments (an error when missing), else $PROBEBOOK_INSTRUMENTS or the
 * user's config file when present (none is fine: the key then says how to set one up).
 */
async function benchInstruments(flag: string | undefined, env: NodeJS.ProcessEnv, cwd: string): Promise<InstrumentSource | null> {
  const path = instrumentsPath(flag, env, cwd);
  if (flag === undefined && !env.PROBEBOOK_INSTRUMENTS && !existsSync(path)) return null;
  const file = await loadInstruments(path);
  return sessionSource(file, new BenchSession(file));
}

/** A `--plan` file as read before the first frame: its name as given and its text. */
export interface PlanFileText {
  readonly file: string;
  readonly text: string;
}

/**
 * The `--plan` files checked in full (a bad one is a usage error, exit 2), the
 * targets cache and the instruments. `notice` hears cache problems, said after
 * the screen closes (a line on stderr would tear the frame).
 */
export async function loadTuiServices(
  args: TuiArgs,
  planTexts: readonly PlanFileText[],
  log: BenchLog,
  io: Pick<CommandIo, 'env' | 'cwd'>,
  notice: (text: string) => void,
): Promise<TuiServices> {
  const plans = planTexts.map(({ file, text }) => loadPlanText(text, file));
  const targetsCache = targetsCacheFor(args.cache, { env: io.env, stderr: notice });
  const catalog = new PlanCatalog(log, plans, { targetsCache });
  const instruments = await benchInstruments(args.instruments, io.env, io.cwd);
  return { catalog, instruments, planEditing: planEditAccess(io.cwd) };
}
