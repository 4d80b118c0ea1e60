import { validateSerial } from '../log/serial.js';
import { openStore } from '../log/open-store.js';
import { partWithRef, refsOfPlanText } from '../plan/refs.js';
import type { LogStore } from '../log/store.js';
import type { BenchLog, BoardFile } from '../log/types.js';
import type { SnapshotBands } from '../review/bands.js';
import { boardHashes, historyCounts, timelineOf } from '../review/history.js';
import type { TargetsCache } from '../log/targets-cache.js';
import { planBandSource } from '../ui/batch/plan-bands.js';
import { formatValue } from '../units/format.js';
import { flatten } from '../units/text.js';
import { parseArgs } from './args.js';
import type { Command, CommandIo } from './command.js';
import { UsageError } from './errors.js';
import { resolveLogDir } from './log-dir.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';
import { bandWords, closeMatches, deviationWords, readingJson } from './record.js';

const usage = 'probebook history SERIAL [--json] [--log DIR] [--cache DIR]';

/** Open the log and read one board, or a UsageError naming the log and the boards close to the serial. */
export async function loadBoard(
  serial: string,
  logFlag: string | boolean | undefined,
  io: CommandIo,
): Promise<{ log: LogStore; board: BoardFile; dir: string }> {
  const problem = validateSerial(serial);
  if (problem) throw new UsageError(problem);
  const dir = resolveLogDir(logFlag, io.env);
  const log = await openStore(dir, { mustExist: true });
  const board = await log.readBoard(serial);
  if (board) return { log, board, dir: log.dir };
  const known = Object.keys((await log.readIndex()).boards);
  const close = closeMatches(serial, known);
  const hint =
    known.length === 0
      ? 'the log has no boards yet (record a reading first, or pass --log DIR)'
      : close.length > 0
        ? `close ones: ${close.join(', ')}`
        : `it has ${known.length} board${known.length === 1 ? '' : 's'}, e.g. ${known.slice(0, 3).join(', ')}`;
  throw new UsageError(`no board ${serial} in ${log.dir}; ${hint}`);
}

/** The targets of every plan revision a board used, by hash (warnings for snapshots that would not load). */
export async function boardBands(
  log: Pick<BenchLog, 'readPlanSnapshot'>,
  board: BoardFile,
  cache: TargetsCache,
): Promise<{ bands: ReadonlyMap<string, SnapshotBands>; problems: string[] }> {
  const source = planBandSource(log, cache);
  const bands = await source.load(boardHashes(board));
  return { bands, problems: source.problems().map((p) => p.message) };
}

/** A local time as `YYYY-MM-DD HH:MM:SS`. */
export function localTime(iso: string): string {
  const d = new Date(iso);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}:${p(d.getSeconds())}`;
}

/** The local UTC offset, e.g. `UTC+01:00`. */
export function utcOffset(at: Date = new Date()): string {
  const minutes = -at.getTimezoneOffset();
  const sign = minutes >= 0 ? '+' : '-';
  const abs = Math.abs(minutes);
  return `UTC${sign}${String(Math.floor(abs / 60)).padStart(2, '0')}:${String(abs % 60).padStart(2, '0')}`;
}

/** The readable timeline: runs started and ended, readings with their band and deviation, rework notes, captures. */
export function historyText(board: BoardFile, bands: ReadonlyMap<string, SnapshotBands>, dir: string, refs: ReadonlyMap<string, string> = new Map()): string {
  const c = historyCounts(board);
  const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
  const lines = [
    `board ${board.serial} · plan ${board.plan ?? '(none)'} · ${plural(c.runs, 'run')} · ${plural(c.readings, 'reading')} (${c.pass} pass, ${c.marginal} marginal, ${c.fail} fail) · ${plural(c.rework, 'rework note')}`,
    `log ${dir} · times local (${utcOffset()})`,
    '',
  ];
  const rows: { at: string; order: number; text: string }[] = [];
  const runNumber = new Map(board.runs.map((r, i) => [r.id, i + 1]));
  for (const entry of timelineOf(board, bands)) {
    if (entry.kind === 'run') {
      const r = entry.run;
      rows.push({
        at: r.started,
        order: 0,
        text: `run ${runNumber.get(r.id)} (${r.id}) started by ${r.operator}, plan ${r.plan} rev ${r.planHash.slice(0, 8)}`,
      });
      if (r.ended) rows.push({ at: r.ended, order: 4, text: `run ${runNumber.get(r.id)} ended: ${r.outcome}` });
    } else if (entry.kind === 'reading') {
      const r = entry.reading;
      const t = entry.target;
      const band = t ? `band ${bandWords(t.worst, t.unit)}` : 'band unknown (plan snapshot missing)';
      const deviation = deviationWords(r.value, entry.deviation);
      const dev = deviation ? `, ${deviation}` : '';
      rows.push({
        at: r.at,
        order: 3,
        text: `  ${r.verdict.toUpperCase().padEnd(8)} ${r.check} = ${formatValue(r.value, r.unit)} (${r.instrument ? `from ${r.instrument.name}, answered` : r.capture ? 'from a capture,' : 'typed'} ${JSON.stringify(r.raw)}, ${r.operator}); ${band}${dev}`,
      });
      for (const w of r.warnings ?? []) rows.push({ at: r.at, order: 3, text: `           warning: ${w}` });
    } else if (entry.kind === 'rework') {
      const w = entry.rework;
      rows.push({ at: w.at, order: 1, text: `rework ${partWithRef(w.part, refs)}: ${w.from} → ${w.to}${w.note ? ` — ${w.note}` : ''} (${w.operator})` });
    } else {
      const k = entry.capture;
      rows.push({ at: k.at, order: 2, text: `  capture ${k.name} → captures/${k.file}${k.check ? ` for ${k.check}` : ''}` });
    }
  }
  rows.sort((a, b) => Date.parse(a.at) - Date.parse(b.at) || a.order - b.order);
  for (const row of rows) lines.push(`${localTime(row.at)}  ${row.text}`);
  if (rows.length === 0) lines.push('no runs or readings yet');
  // Names and notes come from the log as typed (older logs kept them raw): one line each, no control characters.
  return `${lines.map(flatten).join('\n')}\n`;
}

/** `history --json` (DESIGN §7 contract keys, plus `captures`). */
export function historyJson(board: BoardFile) {
  return {
    serial: board.serial,
    runs: board.runs.map((r) => ({
      id: r.id,
      started: r.started,
      ended: r.ended,
      operator: r.operator,
      outcome: r.outcome,
      plan: r.plan,
      planHash: r.planHash,
    })),
    readings: board.readings.map(readingJson),
    rework: board.rework.map((w) => ({ at: w.at, part: w.part, from: w.from, to: w.to, note: w.note, operator: w.operator, run: w.run })),
    captures: board.captures.map((k) => ({ file: k.file, name: k.name, at: k.at, check: k.check, run: k.run })),
  };
}

/** `probebook history SERIAL` (DESIGN §7): one board's runs, readings and rework notes in time order. */
export const historyCommand: Command = async (argv, io) => {
  const args = parseArgs(argv, { options: { json: 'boolean', log: 'string', cache: 'string', help: 'boolean' }, positionals: [0, 1], usage });
  if (args.options.help) {
    io.stdout(
      `usage: ${usage}\n  a board's runs, readings (with the band each was judged against) and rework notes, oldest first\n  --json       the same as data: {"serial","runs","readings","rework"}\n  --log DIR    the log to read (else $PROBEBOOK_LOG, else $XDG_DATA_HOME/probebook); only read, never created\n${cacheHelp}`,
    );
    return 0;
  }
  const serial = args.positionals[0];
  if (serial === undefined) throw new UsageError(`missing argument SERIAL; usage: ${usage}`);
  // Every argument is checked before the log is opened (nothing touches the disk until then).
  const cache = targetsCacheFor(args.options.cache, io);
  const { log, board, dir } = await loadBoard(serial, args.options.log, io);
  if (args.options.json) {
    io.stdout(`${JSON.stringify(historyJson(board))}\n`);
    return 0;
  }
  const { bands, problems } = await boardBands(log, board, cache);
  // Parts are named with their reference designators from the latest run's plan.
  const latest = board.runs[board.runs.length - 1];
  const refs = refsOfPlanText(latest ? await log.readPlanSnapshot(latest.planHash) : null);
  io.stdout(historyText(board, bands, dir, refs));
  for (const p of problems) io.stderr(`probebook: warning: ${p}\n`);
  return 0;
};
