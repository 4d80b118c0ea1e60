import { partWithRef, refsOfPlanText } from '../plan/refs.js';
import { boardState } from '../log/summary.js';
import type { BoardFile, Reading } from '../log/types.js';
import type { CheckBand, SnapshotBands } from '../review/bands.js';
import { historyCounts } from '../review/history.js';
import { formatValue } from '../units/format.js';
import { uncertaintyKey } from '../units/unit.js';
import { markdownCode, markdownText } from '../units/text.js';
import { parseArgs } from './args.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';
import { boardBands, loadBoard, localTime, utcOffset } from './history.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';
import { bandWords, deviationWords } from './record.js';

const usage = 'probebook report SERIAL --format md|csv [--log DIR] [--cache DIR]   (or report --batch …, see probebook report --batch --help)';

export const reportCautions =
  'Cautions: check every rail to ground with the power off before first power; apply first power through a current-limited supply; ' +
  'mind hot parts and charged capacitors; anything mains-powered is for qualified people only. Local codes and licensed practice come first.';

/** The CSV columns of a board report, one row per reading. */
export const boardCsvColumns = [
  'serial',
  'run',
  'check',
  'value',
  'unit',
  'raw',
  'verdict',
  'at',
  'operator',
  'plan_hash',
  'reading_id',
  'nominal',
  'worst_min',
  'worst_max',
  'deviation',
  'test_point',
  'capture',
  'warnings',
] as const;

/**
 * One CSV field per RFC 4180 §2: quoted when it holds a comma, a quote or a
 * line break, inner quotes doubled. Numbers keep every digit (`String(x)`
 * round-trips a double; ±Infinity as `Infinity`). Free text that a spreadsheet
 * would run as a formula (`=…`, `@…`, or `+`/`-` not starting a number) gets a
 * leading `'` (common practice, no source), so a typed operator name cannot
 * become a formula.
 */
export function boardCsvField(value: string | number | null, isText = false): string {
  if (value === null) return '';
  let text = typeof value === 'number' ? String(value) : value;
  if (isText && (/^[=@\t\r]/.test(text) || /^[+-](?![\d.])/.test(text))) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

interface Row {
  readonly reading: Reading;
  readonly band: CheckBand | null;
  readonly deviation: number | null;
}

function rowsOf(board: BoardFile, bands: ReadonlyMap<string, SnapshotBands>): Row[] {
  return board.readings.map((reading) => {
    const band = bands.get(reading.planHash)?.bands.get(reading.check) ?? null;
    const deviation =
      band && band.nominal !== 0 && !band.isLimit && Number.isFinite(reading.value) ? (reading.value - band.nominal) / Math.abs(band.nominal) : null;
    return { reading, band, deviation };
  });
}

/**
 * The board report as CSV (RFC 4180, CRLF line ends, a header row), one row per
 * reading in the order recorded. Values in SI base units; the unit in ASCII as in
 * a plan's `uncertainty` keys (`ohm` for Ω), so any spreadsheet reads it.
 */
export function boardCsv(board: BoardFile, bands: ReadonlyMap<string, SnapshotBands>): string {
  const lines: string[] = [boardCsvColumns.join(',')];
  for (const { reading: r, band, deviation } of rowsOf(board, bands)) {
    const finite = (x: number | undefined) => (x === undefined || !Number.isFinite(x) ? null : x);
    lines.push(
      [
        boardCsvField(board.serial),
        boardCsvField(r.run),
        boardCsvField(r.check, true),
        boardCsvField(r.value),
        boardCsvField(uncertaintyKey(r.unit)),
        boardCsvField(r.raw, true),
        boardCsvField(r.verdict),
        boardCsvField(r.at),
        boardCsvField(r.operator, true),
        boardCsvField(r.planHash),
        boardCsvField(r.id),
        boardCsvField(band && !band.isLimit ? band.nominal : null),
        boardCsvField(finite(band?.worst.min)),
        boardCsvField(finite(band?.worst.max)),
        boardCsvField(deviation),
        boardCsvField(band?.testPoint ?? null, true),
        boardCsvField(r.capture ?? null),
        boardCsvField((r.warnings ?? []).join(' | '), true),
      ].join(','),
    );
  }
  return `${lines.join('\r\n')}\r\n`;
}

/** Text safe inside a Markdown table cell. */
export function mdCell(text: string): string {
  return markdownText(text);
}

function planTitle(text: string | null): string | null {
  if (text === null) return null;
  try {
    const data = JSON.parse(text) as { title?: unknown };
    return typeof data.title === 'string' ? data.title : null;
  } catch {
    return null;
  }
}

/** The board's traveler in Markdown: header, cautions, runs, every reading with its band, rework notes, captures, sign-off. */
export function boardMarkdown(
  board: BoardFile,
  bands: ReadonlyMap<string, SnapshotBands>,
  info: { titles: ReadonlyMap<string, string | null>; dir: string; printed: Date; refs?: ReadonlyMap<string, string> },
): string {
  const c = historyCounts(board);
  const hashes = [...new Set(board.runs.map((r) => r.planHash))];
  const out: string[] = [];
  out.push(`# Traveler: board ${mdCell(board.serial)}`, '');
  out.push('| | |', '| --- | --- |');
  out.push(`| Board | ${mdCell(board.serial)} |`);
  out.push(`| Plan | ${mdCell(board.plan ?? '(none)')} |`);
  for (const h of hashes) out.push(`| Plan revision | ${mdCell(info.titles.get(h) ?? '(title unknown)')} — \`${h}\` |`);
  out.push(`| State | ${boardState(board)} |`);
  out.push(`| Runs | ${c.runs} |`);
  out.push(`| Readings | ${c.readings} (${c.pass} pass, ${c.marginal} marginal, ${c.fail} fail) |`);
  out.push(`| Rework notes | ${c.rework} |`);
  out.push(`| Printed | ${localTime(info.printed.toISOString())} (${utcOffset(info.printed)}) |`);
  out.push(`| Log | ${mdCell(info.dir)} |`, '');
  out.push(`> ${reportCautions}`, '');

  out.push('## Runs', '');
  if (board.runs.length === 0) out.push('No runs yet.', '');
  else {
    out.push('| # | run | started | ended | operator | outcome | plan revision |', '| ---: | --- | --- | --- | --- | --- | --- |');
    for (const [i, r] of board.runs.entries())
      out.push(
        `| ${i + 1} | ${r.id} | ${localTime(r.started)} | ${r.ended ? localTime(r.ended) : '—'} | ${mdCell(r.operator)} | ${r.outcome} | \`${r.planHash.slice(0, 12)}\` |`,
      );
    out.push('');
  }

  out.push('## Readings', '');
  const runNumber = new Map(board.runs.map((r, i) => [r.id, i + 1]));
  const notes: string[] = [];
  if (board.readings.length === 0) out.push('No readings yet.', '');
  else {
    out.push('| # | time | run | check | test point | reading | typed | band (worst case) | nominal | deviation | verdict | operator |');
    out.push('| ---: | --- | ---: | --- | --- | ---: | --- | --- | ---: | ---: | --- | --- |');
    rowsOf(board, bands).forEach(({ reading: r, band, deviation }, i) => {
      const mark = r.warnings && r.warnings.length > 0 ? ` [${notes.length + 1}]` : '';
      for (const w of r.warnings ?? []) notes.push(`${i + 1}. ${r.check}: ${w}`);
      const nominal = band && !band.isLimit ? formatValue(band.nominal, band.unit) : '—';
      const verdict = r.verdict === 'pass' ? 'pass' : `**${r.verdict}**`;
      out.push(
        `| ${i + 1} | ${localTime(r.at)} | ${runNumber.get(r.run) ?? '?'} | ${mdCell(r.check)} | ${mdCell(band?.testPoint ?? '—')} | ${formatValue(r.value, r.unit)} | \`${markdownCode(r.raw)}\` | ${band ? bandWords(band.worst, band.unit) : 'unknown'} | ${nominal} | ${deviationWords(r.value, deviation) ?? '—'} | ${verdict}${mark} | ${mdCell(r.operator)} |`,
      );
    });
    out.push('');
    if (notes.length > 0) out.push('Warnings recorded with the readings (by reading number):', '', ...notes.map((n) => `- ${mdCell(n)}`), '');
  }

  out.push('## Rework notes', '');
  if (board.rework.length === 0) out.push('None.', '');
  else {
    out.push('| time | run | part | from | to | note | operator |', '| --- | ---: | --- | --- | --- | --- | --- |');
    for (const w of board.rework)
      out.push(
        `| ${localTime(w.at)} | ${w.run ? (runNumber.get(w.run) ?? '?') : '—'} | ${mdCell(partWithRef(w.part, info.refs ?? new Map()))} | ${mdCell(w.from)} | ${mdCell(w.to)} | ${mdCell(w.note)} | ${mdCell(w.operator)} |`,
      );
    out.push('');
  }
  if (board.captures.length > 0) {
    out.push('## Captures', '', '| time | check | file | name |', '| --- | --- | --- | --- |');
    for (const k of board.captures) out.push(`| ${localTime(k.at)} | ${mdCell(k.check ?? '—')} | captures/${k.file} | ${mdCell(k.name)} |`);
    out.push('');
  }
  out.push('Bands are the worst-case bands of the plan revision each reading was judged against; verdicts are as recorded.', '');
  out.push('Checked by: ____________________  Date: ____________  Signature: ____________________', '');
  return out.join('\n');
}

/** `probebook report SERIAL --format md|csv` (DESIGN §7); `report --batch …` goes to the batch report. */
export const reportCommand: Command = async (argv, io) => {
  if (argv.includes('--batch')) return (await import('./report-batch.js')).reportBatchCommand(argv, io);
  const args = parseArgs(argv, { options: { format: 'string', log: 'string', cache: 'string', help: 'boolean' }, positionals: [0, 1], usage });
  if (args.options.help) {
    io.stdout(
      `usage: ${usage}\n  --format md    a traveler to print: board, plan revision, runs, every reading with its band and verdict, rework notes (default)\n  --format csv   one row per reading (RFC 4180) for a spreadsheet: ${boardCsvColumns.join(', ')}\n  --log DIR      the log to read (else $PROBEBOOK_LOG, else $XDG_DATA_HOME/probebook); only read, never created\n${cacheHelp}`,
    );
    return 0;
  }
  const format = args.options.format ?? 'md';
  if (format !== 'md' && format !== 'csv')
    throw new UsageError(`--format ${JSON.stringify(format)} is not known; use md (a printable traveler) or csv (a spreadsheet)`);
  const serial = args.positionals[0];
  if (serial === undefined) throw new UsageError(`missing argument SERIAL; usage: ${usage}`);
  // Every argument is checked before the log is opened.
  const cache = targetsCacheFor(args.options.cache, io);
  const { log, board, dir } = await loadBoard(serial, args.options.log, io);
  // The bands and the plan titles both need each snapshot's text: read each file once.
  const texts = new Map<string, Promise<string | null>>();
  const snapshots = {
    readPlanSnapshot(hash: string): Promise<string | null> {
      let text = texts.get(hash);
      if (!text) texts.set(hash, (text = log.readPlanSnapshot(hash)));
      return text;
    },
  };
  const { bands, problems } = await boardBands(snapshots, board, cache);
  if (format === 'csv') io.stdout(boardCsv(board, bands));
  else {
    const titles = new Map<string, string | null>();
    for (const r of board.runs) if (!titles.has(r.planHash)) titles.set(r.planHash, planTitle(await snapshots.readPlanSnapshot(r.planHash)));
    // Parts are named with their reference designators from the latest run's plan.
    const latest = board.runs[board.runs.length - 1];
    const refs = refsOfPlanText(latest ? await snapshots.readPlanSnapshot(latest.planHash) : null);
    io.stdout(boardMarkdown(board, bands, { titles, dir, printed: new Date(), refs }));
  }
  for (const p of problems) io.stderr(`probebook: warning: ${p}\n`);
  return 0;
};
