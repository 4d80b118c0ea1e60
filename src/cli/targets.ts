import { refsOfPlanText } from '../plan/refs.js';
import { defaultSeed, defaultTrials } from '../analysis/targets.js';
import { targetsJson } from '../analysis/targets-json.js';
import type { Distribution } from '../analysis/random.js';
import { loadPlanFile } from '../plan/load.js';
import { intOption, parseArgs } from './args.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';
import { resolveLogDir } from './log-dir.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';
import { computeTargetsInParallel, threadsFromEnv } from './targets-parallel.js';
import { targetsTable } from './targets-table.js';

const usage = 'probebook targets PLAN [--json] [--trials N] [--seed S] [--spread normal|uniform] [--cache DIR] [--log DIR]';

/** Trials above which progress is shown on stderr. */
const progressFrom = 50_000;

/**
 * `probebook targets PLAN` (DESIGN §7): the design targets of a plan with their
 * worst-case and statistical bands, and the design warnings. `--spread`
 * chooses how parts spread within their tolerance (default normal, tol = 3σ).
 * `--log` is accepted like on every command; targets do not touch the log.
 * The bands come from the one targets cache (computed once per plan text,
 * build, trials, seed and spread).
 */
export const targetsCommand: Command = async (argv, io) => {
  const args = parseArgs(argv, {
    options: { json: 'boolean', trials: 'string', seed: 'string', spread: 'string', log: 'string', cache: 'string', help: 'boolean' },
    positionals: [0, 1],
    usage,
    // A negative count is a value, refused by its own range check with the reason.
    negativeNumbers: ['trials', 'seed'],
  });
  if (args.options.help) {
    io.stdout(
      `usage: ${usage}\n  --trials N   Monte Carlo trials (default ${defaultTrials})\n  --seed S     seed of the generator (default ${defaultSeed}); the same seed gives the same bands\n  --spread     normal (default: tolerance = 3σ, truncated) or uniform\n  --json       machine-readable output in SI base units\n${cacheHelp}`,
    );
    return 0;
  }
  const file = args.positionals[0];
  if (file === undefined) throw new UsageError(`missing argument PLAN; usage: ${usage}`);
  const trials = intOption(args.options.trials, 'trials', defaultTrials, 100, 10_000_000);
  const seed = intOption(args.options.seed, 'seed', defaultSeed, 0, 4_294_967_295);
  const spread = args.options.spread ?? 'normal';
  if (spread !== 'normal' && spread !== 'uniform') throw new UsageError(`--spread takes normal or uniform, got ${JSON.stringify(spread)}`);
  const distribution: Distribution = spread;
  // Accepted like on every command (and an empty one refused); targets never touch the log.
  resolveLogDir(args.options.log, io.env);
  const cache = targetsCacheFor(args.options.cache, io);

  const plan = await loadPlanFile(file, { cwd: io.cwd });
  let shown = 0;
  const settings = {
    trials,
    seed,
    distribution,
    ...(trials >= progressFrom
      ? {
          onProgress: (done: number, total: number) => {
            // Every tenth, so a long run shows it is alive without flooding the terminal.
            const tenth = Math.floor((10 * done) / total);
            if (tenth > shown) {
              shown = tenth;
              io.stderr(`probebook: ${tenth * 10} % of ${total} trials\n`);
            }
          },
        }
      : {}),
  };
  // From the cache, else computed on two threads (the Monte Carlo beside the worst-case search) and kept.
  const key = cache.keyOf(plan, settings);
  let set = cache.peek(key);
  if (!set) {
    set = await computeTargetsInParallel(plan, settings, threadsFromEnv(io.env['PROBEBOOK_THREADS']), (message) =>
      io.stderr(`probebook: warning: ${message}\n`),
    );
    cache.put(key, set);
  }
  if (args.options.json) io.stdout(`${JSON.stringify(targetsJson(set), null, 2)}\n`);
  else
    io.stdout(
      targetsTable(set, {
        title: plan.title,
        file,
        trials,
        seed,
        distribution,
        ...(plan.note === undefined ? {} : { note: plan.note }),
        refs: refsOfPlanText(plan.text),
      }),
    );
  return 0;
};
