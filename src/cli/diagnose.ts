import { type Diagnosis, diagnose } from '../analysis/diagnose.js';
import type { BoardFile, Run } from '../log/types.js';
import { loadPlanText } from '../plan/load.js';
import type { Plan } from '../plan/types.js';
import { planBandSource } from '../ui/batch/plan-bands.js';
import { parseArgs } from './args.js';
import type { Command, CommandIo } from './command.js';
import { UsageError } from './errors.js';
import { loadBoard } from './history.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';

const usage = 'probebook diagnose SERIAL [--run ID] [--top N] [--json] [--log DIR] [--cache DIR]';

const help = `usage: ${usage}
  which single part on the board explains its readings, and how (wrong value, open,
  shorted, fitted backwards, not fitted, a rail off): every fault is re-evaluated
  through the whole chain and listed only if it reproduces every reading of the run
  --run ID   the run to diagnose (default: the board's latest run with readings)
  --top N    list at most N hypotheses (default 5)
  --json     {"serial","run","plan","hypotheses":[{"rank","part","ref","mode","value",
             "label","score","explains","predicted"}],"unexplained":[…]}
  --log DIR  the log to read (else $PROBEBOOK_LOG, else $XDG_DATA_HOME/probebook); only read, never created
${cacheHelp}`;

/** The run to diagnose: the one named (an id or a unique start of one), else the latest with readings. */
export function pickRun(board: BoardFile, wanted: string | undefined): Run {
  if (wanted !== undefined) {
    const exact = board.runs.find((r) => r.id === wanted);
    const matches = exact ? [exact] : board.runs.filter((r) => r.id.startsWith(wanted));
    if (matches.length === 1 && matches[0]) return matches[0];
    const ids = board.runs.map((r) => r.id).join(', ') || 'none';
    throw new UsageError(
      matches.length > 1
        ? `--run ${wanted} matches several runs of ${board.serial}; give more of the id (runs: ${ids})`
        : `board ${board.serial} has no run ${wanted}; its runs are ${ids}`,
    );
  }
  const withReadings = [...board.runs].reverse().find((r) => board.readings.some((x) => x.run === r.id));
  const run = withReadings ?? board.runs[board.runs.length - 1];
  if (!run) throw new UsageError(`board ${board.serial} has no runs yet; record readings first`);
  return run;
}

/** `diagnose --json` (DESIGN §5a contract keys, plus `alternatives`, `separate`, `next` and `hints`). */
export function diagnosisJson(serial: string, run: string, plan: string, d: Diagnosis) {
  return {
    serial,
    run,
    plan,
    hypotheses: d.hypotheses.map((h) => ({
      rank: h.rank,
      part: h.part,
      ref: h.ref,
      mode: h.mode,
      value: h.value,
      label: h.label,
      score: Number(h.score.toFixed(4)),
      explains: h.explains,
      predicted: Object.fromEntries(Object.entries(h.predicted).map(([k, v]) => [k, Number.isFinite(v) ? v : null])),
      alternatives: h.alternatives.map((a) => ({ part: a.part, ref: a.ref, mode: a.mode, value: a.value, label: a.label, score: Number(a.score.toFixed(4)) })),
      separate: h.separate,
    })),
    unexplained: d.unexplained,
    next: d.next,
    hints: d.hints,
  };
}

/** The diagnosis as a technician reads it. */
export function diagnosisText(serial: string, run: Run, d: Diagnosis, readings: number): string {
  const lines = [`board ${serial} · run ${run.id} · plan ${run.plan} · ${readings} reading${readings === 1 ? '' : 's'}`, ''];
  if (d.allPass) {
    lines.push('every reading passed: nothing to explain, no fault hypothesis');
    return `${lines.join('\n')}\n`;
  }
  if (d.hypotheses.length === 0 && d.unexplained.length === 0) {
    lines.push('no reading lies outside what a healthy board reads (the marginal ones are within the instrument and model error): no fault hypothesis');
    return `${lines.join('\n')}\n`;
  }
  if (d.hypotheses.length === 0) lines.push('no single fault reproduces these readings (two faults, a model limit, or a measurement slip?)');
  for (const h of d.hypotheses) {
    lines.push(`${String(h.rank).padStart(2)}. ${(h.score * 100).toFixed(0).padStart(3)} %  ${h.label}`);
    lines.push(`           explains ${h.explains.join(', ')}`);
    if (h.alternatives.length > 0) {
      lines.push(`           the readings cannot tell it from: ${h.alternatives.map((a) => a.label).join('; ')}`);
      if (h.separate) lines.push(`           to tell them apart: ${h.separate}`);
    }
  }
  if (d.unexplained.length > 0) lines.push('', `unexplained by any single fault: ${d.unexplained.join(', ')}`);
  if (d.next) lines.push('', `next check: ${d.next.why}`);
  // The hints of the unexplained readings first; a few lines, the JSON has them all.
  const hints = [...d.hints]
    .filter((h) => h.hints.length > 0)
    .sort((a, b) => Number(d.unexplained.includes(b.check)) - Number(d.unexplained.includes(a.check)))
    .slice(0, 4);
  if (hints.length > 0) {
    lines.push('', 'fault hints (not verified against the readings):');
    for (const h of hints) lines.push(`  ${h.check}: ${h.hints.slice(0, 3).join('; ')}`);
  }
  lines.push(
    '',
    "caution: power off and let the capacitors discharge before any rework; output transistors and regulators may be hot. Follow local codes and your site's practice.",
  );
  return `${lines.join('\n')}\n`;
}

async function planOf(log: { readPlanSnapshot(hash: string): Promise<string | null> }, run: Run): Promise<Plan> {
  const text = await log.readPlanSnapshot(run.planHash);
  if (text === null) throw new Error(`the plan snapshot ${run.planHash.slice(0, 12)} of run ${run.id} is missing from the log; the run cannot be diagnosed`);
  return loadPlanText(text, `plan snapshot ${run.planHash.slice(0, 12)} (${run.plan})`);
}

/** `probebook diagnose SERIAL` (DESIGN §5a, §7). */
export const diagnoseCommand: Command = async (argv, io: CommandIo) => {
  const args = parseArgs(argv, {
    options: { json: 'boolean', log: 'string', cache: 'string', help: 'boolean', run: 'string', top: 'string' },
    positionals: [0, 1],
    usage,
  });
  if (args.options.help) {
    io.stdout(help);
    return 0;
  }
  const serial = args.positionals[0];
  if (serial === undefined) throw new UsageError(`missing argument SERIAL; usage: ${usage}`);
  const topText = args.options.top;
  const top = typeof topText === 'string' ? Number(topText) : 5;
  if (!Number.isInteger(top) || top < 1) throw new UsageError(`--top ${String(topText)} is not a count; write a whole number from 1, e.g. --top 3`);
  // Every argument is checked before the log is opened.
  const cache = targetsCacheFor(args.options.cache, io);
  const { log, board } = await loadBoard(serial, args.options.log, io);
  let run: Run;
  let plan: Plan;
  let bands: Awaited<ReturnType<ReturnType<typeof planBandSource>['get']>>;
  try {
    run = pickRun(board, typeof args.options.run === 'string' ? args.options.run : undefined);
    plan = await planOf(log, run);
    const source = planBandSource(log, cache);
    bands = await source.get(run.planHash);
    if (!bands)
      throw new Error(
        `the targets of plan ${run.plan} (${run.planHash.slice(0, 12)}) could not be computed: ${source
          .problems()
          .map((p) => p.message)
          .join('; ')}`,
      );
  } finally {
    // Everything is read: a shared (PostgreSQL) log lets its connections go.
    await log.close();
  }
  const readings = board.readings.filter((r) => r.run === run.id);
  const d = diagnose(plan, [...bands.bands.values()], readings, { top });
  if (args.options.json) io.stdout(`${JSON.stringify(diagnosisJson(board.serial, run.id, run.plan, d))}\n`);
  else io.stdout(diagnosisText(board.serial, run, d, readings.length));
  return 0;
};
