import { openStore } from '../log/open-store.js';
import type { LogIndex } from '../log/types.js';
import type { BandSource } from '../review/bands.js';
import { batchFigures, revisionsOf, weakestFirst } from '../review/batch.js';
import { batchJson } from '../review/batch-json.js';
import type { BatchFigures } from '../review/batch-types.js';
import { describeFilter, parseDateBound, type BatchFilter } from '../review/filter.js';
import { padCell, cpkWord, formatFigure, formatIndex, formatPercent, padCellRight } from '../review/format.js';
import { planBandSource } from '../ui/batch/plan-bands.js';
import { parseArgs, type ParsedArgs } from './args.js';
import type { Command, CommandIo } from './command.js';
import { UsageError } from './errors.js';
import { resolveLogDir } from './log-dir.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';

/** Options every batch view shares (the shell table, the JSON and the reports). */
export const batchOptions = { plan: 'string', rev: 'string', check: 'string', from: 'string', to: 'string', log: 'string', cache: 'string' } as const;

const usage = 'probebook batch [--plan ID] [--rev HASH] [--check ID] [--from DATE] [--to DATE] [--json] [--log DIR] [--cache DIR]';

/** The filter the options describe, or a UsageError that says what to type. */
function filterFromOptions(options: ParsedArgs['options']): BatchFilter {
  const text = (name: string): string | undefined => {
    const v = options[name];
    if (v === undefined) return undefined;
    if (typeof v !== 'string' || v.trim() === '') throw new UsageError(`--${name} needs a value`);
    return v.trim();
  };
  const date = (name: 'from' | 'to'): number | undefined => {
    const v = text(name);
    if (v === undefined) return undefined;
    const ms = parseDateBound(v, name);
    if (ms === null) throw new UsageError(`--${name} ${JSON.stringify(v)} is not a date; write e.g. 2026-11-30 or 2026-11-30T14:00:00Z`);
    return ms;
  };
  const rev = text('rev');
  if (rev !== undefined && !/^[0-9a-f]{4,64}$/i.test(rev))
    throw new UsageError(`--rev ${JSON.stringify(rev)} is not a plan hash; give at least 4 hex digits of it (history shows them)`);
  const filter: BatchFilter = {
    ...(text('plan') === undefined ? {} : { plan: text('plan') as string }),
    ...(rev === undefined ? {} : { revision: rev.toLowerCase() }),
    ...(text('check') === undefined ? {} : { check: text('check') as string }),
    ...(date('from') === undefined ? {} : { from: date('from') as number }),
    ...(date('to') === undefined ? {} : { to: date('to') as number }),
  };
  if (filter.from !== undefined && filter.to !== undefined && filter.from > filter.to) throw new UsageError('--from is after --to; swap them');
  return filter;
}

/** Whether any board has a reading of the check (through the index's columns where it has them). */
function hasCheck(index: LogIndex, check: string): boolean {
  const columns = index.checkColumns;
  const id = columns ? columns.checkIds.indexOf(check) : -1;
  for (const serial in index.boards) {
    const b = columns ? columns.rowsOf(serial) : -1;
    if (columns && b >= 0) {
      if (id < 0) continue;
      for (let r = columns.rowStart[b] ?? 0; r < (columns.rowStart[b + 1] ?? 0); r++) if (columns.checkOf[r] === id) return true;
    } else if (check in (index.boards[serial]?.checks ?? {})) return true;
  }
  return false;
}

/** Refuse a plan or check the log has never seen, naming the ones it has. */
function checkFilterAgainstIndex(index: LogIndex, filter: BatchFilter, dir: string): void {
  const boards = Object.values(index.boards);
  if (filter.plan !== undefined && !boards.some((b) => b.plan === filter.plan)) {
    const plans = [...new Set(boards.map((b) => b.plan).filter((p): p is string => p !== null))].sort();
    throw new UsageError(
      `no boards of plan ${JSON.stringify(filter.plan)} in the log ${dir}; ${plans.length ? `plans there: ${plans.slice(0, 8).join(', ')}` : 'it has no runs yet'}`,
    );
  }
  if (filter.check !== undefined && !hasCheck(index, filter.check)) {
    throw new UsageError(
      `no readings of check ${JSON.stringify(filter.check)} in the log ${dir}; check ids look like osc.freq or rails.+12V.dc (targets PLAN lists them)`,
    );
  }
}

/** Read the index, load the bands of the revisions it selects, and compute the figures. */
async function loadBatch(index: LogIndex, bands: BandSource, filter: BatchFilter): Promise<BatchFigures> {
  const snapshots = await bands.load(revisionsOf(index, filter));
  return batchFigures(index, snapshots, filter, bands.problems());
}

/** Open the log, check the filter, compute. Progress of an index rebuild goes to stderr. */
export async function runBatch(options: ParsedArgs['options'], io: CommandIo): Promise<{ figures: BatchFigures; filter: BatchFilter; dir: string }> {
  const filter = filterFromOptions(options);
  const dir = resolveLogDir(options.log, io.env);
  // Every argument is checked before the log is opened.
  const cache = targetsCacheFor(options.cache, io);
  // A review only reads: a mistyped --log must not leave an empty log behind.
  const log = await openStore(dir, { mustExist: true });
  let shown = 0;
  const index = await log.readIndex(
    (done, total) => {
      // A rebuild of thousands of boards takes a while: say so every tenth.
      if (total >= 500 && (done === total || done - shown >= total / 10)) {
        shown = done;
        io.stderr(`reading board files for the index: ${done} of ${total}\n`);
      }
    },
    { verify: true },
  );
  checkFilterAgainstIndex(index, filter, log.dir);
  let said = -1;
  const bands = planBandSource(log, cache, (hash, done, total) => {
    // The first review of a new plan revision runs its Monte Carlo once (then cached).
    const tenth = Math.floor((10 * done) / total);
    if (tenth === said) return;
    said = tenth;
    io.stderr(`computing the targets of plan snapshot ${hash.slice(0, 12)} (once, then cached): ${tenth * 10} %\n`);
  });
  const figures = await loadBatch(index, bands, filter);
  return { figures, filter, dir: log.dir };
}

/** The readable table: weakest check first. */
function batchTable(f: BatchFigures, filter: BatchFilter): string {
  const lines: string[] = [];
  const leftOut = f.problems.filter((p) => p.serial !== undefined).length;
  lines.push(
    `batch · ${describeFilter(filter)} · ${f.boards} board${f.boards === 1 ? '' : 's'}${f.incomplete ? ` (${f.incomplete} not through every check)` : ''}${leftOut ? ` · ${leftOut} left out (damaged board file${leftOut === 1 ? '' : 's'}, see the warnings)` : ''}`,
  );
  lines.push(
    `first-pass yield ${formatPercent(f.firstPassYield)} (${f.firstPassBoards}/${f.boards}) · final yield ${formatPercent(f.finalYield)} (${f.finalPassBoards}/${f.boards})`,
  );
  if (f.checks.length === 0) {
    lines.push('no readings match; widen the filter or record some readings first');
    for (const p of f.problems) lines.push(`warning: ${p.message}`);
    return `${lines.join('\n')}\n`;
  }
  lines.push('');
  lines.push(
    `${padCell('check (weakest first)', 24)}${padCellRight('n', 7)}${padCellRight('pass', 7)}${padCellRight('marg', 7)}${padCellRight('fail', 7)}${padCellRight('final', 8)}${padCellRight('mean', 13)}${padCellRight('sd', 12)}${padCellRight('Cp', 6)}${padCellRight('Cpk', 6)}  capability`,
  );
  for (const c of [...f.checks].sort(weakestFirst)) {
    const word = c.status === 'ok' || c.status === 'one-sided' ? cpkWord(c.cpk) : c.status === 'no-band' ? 'no band' : 'not enough data';
    lines.push(
      `${padCell(c.check, 24)}${padCellRight(String(c.n), 7)}${padCellRight(String(c.pass), 7)}${padCellRight(String(c.marginal), 7)}${padCellRight(String(c.fail), 7)}${padCellRight(formatPercent(c.finalYield), 8)}${padCellRight(formatFigure(c.mean, c.unit), 13)}${padCellRight(formatFigure(c.sd, c.unit, 3), 12)}${padCellRight(formatIndex(c.cp), 6)}${padCellRight(formatIndex(c.cpk), 6)}  ${word}`,
    );
  }
  const plans = new Set(f.checks.map((c) => c.plan));
  if (plans.size > 1) lines.push('', `several plans are mixed (${[...plans].join(', ')}); pass --plan ID to review one`);
  const notes = f.checks.filter((c) => c.status !== 'ok');
  for (const c of notes) lines.push(`${c.check}: ${c.note}`);
  for (const c of f.checks.filter((x) => x.bandsDiffer)) lines.push(`${c.check}: boards of older plan revisions were judged against a different band`);
  const outliers = f.checks.flatMap((c) => c.outliers.map((o) => `${o.serial} (${c.check} ${formatFigure(o.value, c.unit)}, ${o.reasons.join(', ')})`));
  if (outliers.length > 0) {
    lines.push('', `outlier boards (${outliers.length}): ${outliers.slice(0, 8).join('; ')}${outliers.length > 8 ? '; …' : ''}`);
    lines.push('open one with: probebook history SERIAL');
  }
  for (const p of f.problems) lines.push(`warning: ${p.message}`);
  return `${lines.join('\n')}\n`;
}

/** What `batch --help` prints. */
const batchHelpText = `usage: ${usage}
  the latest reading of each check on each board: n, pass/marginal/fail, mean, sd,
  min, max, Cp and Cpk against the worst-case band, first-pass and final yield;
  the table lists the weakest check first, --json prints {"checks":[…]} in plan order.
  --plan ID      one plan            --rev HASH   one plan revision (4+ hex digits)
  --check ID     one check           --from/--to  date range of the latest reading
                                                  (2026-11-30 or 2026-11-30T14:00:00Z, UTC)
  --log DIR      the log to read (else $PROBEBOOK_LOG, else $XDG_DATA_HOME/probebook); only read, never created
${cacheHelp}`;

export const batchCommand: Command = async (argv, io) => {
  if (argv.includes('--help') || argv.includes('-h')) {
    io.stdout(batchHelpText);
    return 0;
  }
  const args = parseArgs(argv, { options: { ...batchOptions, json: 'boolean' }, usage });
  const { figures, filter } = await runBatch(args.options, io);
  if (args.options.json) io.stdout(`${JSON.stringify(batchJson(figures, describeFilter(filter)))}\n`);
  else io.stdout(batchTable(figures, filter));
  return 0;
};
