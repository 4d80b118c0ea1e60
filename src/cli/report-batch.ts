import { batchCsv } from '../review/batch-csv.js';
import { batchMarkdown } from '../review/batch-md.js';
import { describeFilter } from '../review/filter.js';
import { parseArgs } from './args.js';
import { batchOptions, runBatch } from './batch.js';
import { cacheHelp } from './targets-cache.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';

const usage = 'probebook report --batch --format md|csv [--plan ID] [--rev HASH] [--check ID] [--from DATE] [--to DATE] [--log DIR] [--cache DIR]';

/**
 * `report --batch`: the batch figures as a file a quality engineer can keep —
 * Markdown to read, or CSV (RFC 4180) with the same figures as `batch --json`.
 */
export const reportBatchCommand: Command = async (argv, io) => {
  if (argv.includes('--help') || argv.includes('-h')) {
    io.stdout(
      `usage: ${usage}\n  md: a report to read and file; csv: one row per check with the batch --json figures (RFC 4180).\n  The filters are those of probebook batch (see probebook batch --help).\n${cacheHelp}`,
    );
    return 0;
  }
  const args = parseArgs(argv, { options: { ...batchOptions, batch: 'boolean', format: 'string' }, usage });
  const format = args.options.format;
  if (format === undefined) throw new UsageError(`--format is needed: md for a readable report, csv for a spreadsheet; usage: ${usage}`);
  if (format !== 'md' && format !== 'csv') throw new UsageError(`--format ${JSON.stringify(format)} is not known; use md or csv`);
  const { figures, filter, dir } = await runBatch(args.options, io);
  if (format === 'csv') io.stdout(batchCsv(figures));
  else io.stdout(batchMarkdown(figures, { filter: describeFilter(filter), generated: new Date().toISOString(), logDir: dir }));
  for (const p of figures.problems) io.stderr(`probebook: warning: ${p.message}\n`);
  return 0;
};
