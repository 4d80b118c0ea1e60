import { nextCheck } from '../analysis/next-check.js';
import { defaultSeed, defaultTrials } from '../analysis/targets.js';
import type { Band, Target, TargetSet, Verdict } from '../analysis/types.js';
import { uncertaintyFor, verdictFor } from '../analysis/verdict.js';
import { validateSerial } from '../log/serial.js';
import { openStore } from '../log/open-store.js';
import type { InstrumentRef, Reading, RunOutcome } from '../log/types.js';
import { readFromInstrument } from './instrument-reading.js';
import { loadPlanFile } from '../plan/load.js';
import type { Plan } from '../plan/types.js';
import type { Unit } from '../units/unit.js';
import { formatValue } from '../units/format.js';
import { parseValue } from '../units/parse.js';
import { maxOperatorLength, oneLine } from '../units/text.js';
import { parseArgs } from './args.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';
import { resolveLogDir } from './log-dir.js';
import { cacheHelp, targetsCacheFor } from './targets-cache.js';

const usage =
  'probebook record --plan PLAN --board SERIAL --check ID (--value TEXT | --from INSTRUMENT [--instruments FILE]) [--operator NAME] [--decimal-comma] [--json] [--log DIR] [--cache DIR]';

/** The reading as `record --json` and `history --json` print it (DESIGN §7); ±∞ (an open circuit) as null. */
export function readingJson(r: Reading) {
  return {
    id: r.id,
    run: r.run,
    check: r.check,
    value: Number.isFinite(r.value) ? r.value : null,
    unit: r.unit,
    raw: r.raw,
    at: r.at,
    operator: r.operator,
    verdict: r.verdict,
    ...(r.instrument ? { instrument: { name: r.instrument.name, identity: r.instrument.identity } } : {}),
  };
}

/**
 * `--operator`, else `$PROBEBOOK_OPERATOR`, else `$USER`, else "unknown", as one
 * clean line (control characters and line breaks never reach the log: they
 * would colour a terminal or forge history lines), at most 64 characters.
 */
export function operatorOf(flag: string | boolean | undefined, env: NodeJS.ProcessEnv): string {
  const sources: [string | boolean | undefined, string][] = [
    [flag, '--operator'],
    [env.PROBEBOOK_OPERATOR, 'PROBEBOOK_OPERATOR'],
    [env.USER, 'USER'],
  ];
  for (const [v, from] of sources) {
    if (typeof v !== 'string') continue;
    const name = oneLine(v);
    if (name === '') continue;
    if (name.length > maxOperatorLength)
      throw new UsageError(`${from}: an operator name is at most ${maxOperatorLength} characters (got ${name.length}); nothing was saved`);
    return name;
  }
  return 'unknown';
}

function editDistance(a: string, b: string): number {
  let row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const next = [i];
    for (let j = 1; j <= b.length; j++) next.push(Math.min((row[j] ?? 0) + 1, (next[j - 1] ?? 0) + 1, (row[j - 1] ?? 0) + (a[i - 1] === b[j - 1] ? 0 : 1)));
    row = next;
  }
  return row[b.length] ?? 0;
}

/** Check ids of the plan that look like `typed`: same stage, or a few edits away. */
export function closeMatches(typed: string, ids: readonly string[]): string[] {
  const stage = typed.split('.')[0] ?? '';
  return ids
    .map((id) => ({ id, d: editDistance(typed.toLowerCase(), id.toLowerCase()) - (id.startsWith(`${stage}.`) ? 2 : 0) }))
    .filter((x) => x.d <= Math.max(3, typed.length / 3))
    .sort((a, b) => a.d - b.d)
    .slice(0, 5)
    .map((x) => x.id);
}

const openWords = /^(ol|o\.l\.|open|inf|infinity|∞)$/i;

/**
 * Whether the bench writes decimal commas (`"1,500"` is 1.5): `--decimal-comma`,
 * `PROBEBOOK_DECIMAL_COMMA=1`, or the plan's `"decimalComma": true`. Without
 * it a comma before exactly three digits is refused as ambiguous.
 */
export function decimalCommaOf(flag: string | boolean | undefined, env: NodeJS.ProcessEnv, plan?: Pick<Plan, 'decimalComma'>): boolean {
  if (flag === true || plan?.decimalComma === true) return true;
  const setting = env.PROBEBOOK_DECIMAL_COMMA?.trim().toLowerCase();
  return setting === '1' || setting === 'true' || setting === 'yes';
}

/** The reading typed for a check, in SI base units, or a UsageError saying what to type. */
export function readValue(text: string, target: Target, options: { readonly decimalComma?: boolean } = {}): number {
  if (target.unit === 'Ω' && openWords.test(text.trim())) return Infinity;
  const parsed = parseValue(text, { expected: target.unit, allowTolerance: false, decimalComma: options.decimalComma ?? false });
  if (!parsed.ok)
    throw new UsageError(`check ${target.check}: ${parsed.message}${target.unit === 'Ω' ? ' (an open circuit may be typed OL)' : ''}; nothing was saved`);
  return parsed.value;
}

/** Safety checks (unpowered, first power) with no reading in this run, for a powered reading. */
function skippedSafety(targets: readonly Target[], target: Target, done: ReadonlyMap<string, Verdict>): string[] {
  if (target.phase === 'unpowered') return [];
  const before = target.phase === 'first-power' ? ['unpowered'] : ['unpowered', 'first-power'];
  const skipped = targets.filter((t) => before.includes(t.phase) && !done.has(t.check)).map((t) => t.check);
  const warnings: string[] = [];
  if (skipped.length > 0) {
    warnings.push(
      `safety checks skipped: ${skipped.join(', ')} ${skipped.length === 1 ? 'has' : 'have'} no reading in this run; with power off, make them before going on (a short or a reversed part can burn the board)`,
    );
  }
  const idle = targets.find((t) => t.phase === 'first-power');
  if (idle && target.phase !== 'first-power' && done.get(idle.check) === 'fail')
    warnings.push(`${idle.check} read above its limit in this run: power off before probing further`);
  return warnings;
}

/** Latest verdict per check among a run's readings. */
function latestVerdicts(readings: readonly Reading[], run: string): Map<string, Verdict> {
  const done = new Map<string, Verdict>();
  for (const r of readings) if (r.run === run) done.set(r.check, r.verdict);
  return done;
}

/** A band in words: `3.159 V … 3.378 V`, `at least 100 Ω`, `at most 25 mA`. */
export function bandWords(worst: Band, unit: Unit): string {
  if (worst.max === Infinity) return `at least ${formatValue(worst.min, unit)}`;
  if (worst.min === -Infinity) return `at most ${formatValue(worst.max, unit)}`;
  return `${formatValue(worst.min, unit)} … ${formatValue(worst.max, unit)}`;
}

/** The signed deviation in % of nominal (`+4.06 %`), or null where it means nothing. */
export function deviationWords(value: number, deviation: number | null): string | null {
  if (!Number.isFinite(value) || deviation === null || !Number.isFinite(deviation)) return null;
  return `${deviation >= 0 ? '+' : ''}${(deviation * 100).toFixed(2)} %`;
}

function bandText(t: Target): string {
  const band = bandWords(t.worst, t.unit);
  if (!Number.isFinite(t.worst.min) || !Number.isFinite(t.worst.max)) return band;
  return !t.isLimit ? `${band} (worst case), nominal ${formatValue(t.nominal, t.unit)}` : `${band} (worst case)`;
}

function deviationText(deviation: number, value: number, target: Target): string {
  if (!Number.isFinite(value)) return 'open circuit';
  if (target.isLimit) return 'a limit check';
  if (Number.isNaN(deviation)) return 'deviation n/a (nominal 0)';
  return `${deviationWords(value, deviation)} from nominal`;
}

interface Outcome {
  readonly reading: Reading;
  readonly target: Target;
  readonly deviation: number;
  readonly uncertainty: number;
  readonly next: { check: string; why: string } | null;
  readonly ended: RunOutcome | null;
  readonly startedRun: boolean;
}

function readable(o: Outcome, serial: string, logDir: string): string {
  const { reading: r, target: t } = o;
  const unit = t.unit;
  const lines = [
    `${r.verdict.toUpperCase()}  ${r.check} = ${Number.isFinite(r.value) ? formatValue(r.value, unit) : 'OL'}  (${r.instrument ? `from ${r.instrument.name}, answered` : 'typed'} ${JSON.stringify(r.raw)})`,
    `  band ${bandText(t)}; ${deviationText(o.deviation, r.value, t)}`,
    `  reading uncertainty ±${formatValue(o.uncertainty, unit)} (guard band)${t.testPoint ? `, at ${t.testPoint}` : ''}`,
  ];
  for (const w of r.warnings ?? []) lines.push(`  warning: ${w}`);
  lines.push(`saved to board ${serial} (${o.startedRun ? 'new run' : 'run'} ${r.run}, reading ${r.id}) in ${logDir}`);
  if (o.ended) lines.push(`every check has a reading: run ended ${o.ended}`);
  if (o.next) lines.push(`next: ${o.next.check} — ${o.next.why}`);
  else if (!o.ended) lines.push('next: nothing left to check');
  return `${lines.join('\n')}\n`;
}

/** How a run ends once every check has a reading: passed only when every latest verdict is pass. */
function outcomeOf(done: ReadonlyMap<string, Verdict>): RunOutcome {
  return [...done.values()].every((v) => v === 'pass') ? 'passed' : 'failed';
}

function findTarget(set: TargetSet, plan: Plan, check: string): Target {
  const target = set.targets.find((t) => t.check === check);
  if (target) return target;
  const close = closeMatches(
    check,
    set.targets.map((t) => t.check),
  );
  throw new UsageError(
    `no check ${JSON.stringify(check)} in plan ${plan.file}; ${close.length ? `close ones: ${close.join(', ')}` : 'probebook targets PLAN lists them'}; nothing was saved`,
  );
}

/**
 * `probebook record` (DESIGN §7): judge one reading against its check's
 * worst-case band with the instrument's guard band, save it (starting a run
 * when the board has none open), and say what to measure next. A reading is
 * never refused for its order: a skipped safety check is a warning on it.
 */
export const recordCommand: Command = async (argv, io) => {
  const args = parseArgs(argv, {
    options: {
      plan: 'string',
      board: 'string',
      check: 'string',
      value: 'string',
      from: 'string',
      instruments: 'string',
      operator: 'string',
      json: 'boolean',
      log: 'string',
      cache: 'string',
      help: 'boolean',
      'decimal-comma': 'boolean',
    },
    usage,
    negativeNumbers: ['value'],
  });
  if (args.options.help) {
    io.stdout(
      `usage: ${usage}\n  --value TEXT   as read: "11.93", "-11.95 V", "4k62", "1.02 kHz"; an open circuit on a resistance check as OL;\n                 no spaces inside the number; "1,500" is refused as ambiguous (write 1.5 or 1500)\n  --decimal-comma  the bench writes decimal commas ("1,500" is 1.5); also PROBEBOOK_DECIMAL_COMMA=1 or the plan's "decimalComma": true\n  --from NAME    take the reading from that bench instrument (SCPI; see probebook instruments --help);\n                 its query by check id, else by unit; an overload (9.9E37) is recorded as OL;\n                 no answer within its timeout, or no number, records nothing (exit 1)\n  --instruments FILE  the instruments file (else $PROBEBOOK_INSTRUMENTS, else $XDG_CONFIG_HOME/probebook/instruments.json)\n  --operator     default $PROBEBOOK_OPERATOR, else $USER\n  --json         machine-readable, SI base units\n  --log DIR      the log to write (else $PROBEBOOK_LOG, else $XDG_DATA_HOME/probebook)\n${cacheHelp}verdict: guarded acceptance with the guard band w = U (ILAC-G8:09/2019 terms), U the plan's instrument uncertainty for the reading:\n  pass when reading ± U lies inside the worst-case band, fail when wholly outside, marginal otherwise;\n  a band that stops at a physical floor (a dead band of 0 V, a THD, an idle current) is guarded on its open side only: a reading at the floor passes\nCaution: make the unpowered checks first and apply first power through a current-limited supply; follow local codes and licensed practice for anything mains-powered.\n`,
    );
    return 0;
  }
  const need = (name: string): string => {
    const v = args.options[name];
    if (typeof v !== 'string' || v.trim() === '') throw new UsageError(`--${name} is needed; usage: ${usage}`);
    return v;
  };
  const fromName = args.options.from;
  if (fromName !== undefined && args.options.value !== undefined) throw new UsageError(`give --value or --from, not both; usage: ${usage}`);
  if (fromName === undefined && args.options.instruments !== undefined) throw new UsageError(`--instruments goes with --from; usage: ${usage}`);
  const [planFile, serial, check] = [need('plan'), need('board').trim(), need('check').trim()];
  const serialProblem = validateSerial(serial);
  if (serialProblem) throw new UsageError(`--board: ${serialProblem}`);
  const dir = resolveLogDir(args.options.log, io.env);
  if (fromName === undefined) need('value');
  else if (typeof fromName !== 'string' || fromName.trim() === '') throw new UsageError(`--from needs an instrument name; usage: ${usage}`);
  const plan = await loadPlanFile(planFile, { cwd: io.cwd });
  // The plan's targets come from the one cache (computed once per plan revision and build).
  const set = targetsCacheFor(args.options.cache, io).forPlan(plan, { trials: defaultTrials, seed: defaultSeed });
  const target = findTarget(set, plan, check);
  let text: string;
  let value: number;
  let instrument: InstrumentRef | undefined;
  let record: { readonly name: string; readonly bytes: Uint8Array } | undefined;
  if (typeof fromName === 'string') {
    // Nothing is saved unless the instrument gave a usable number (DESIGN §7a).
    const taken = await readFromInstrument(fromName.trim(), typeof args.options.instruments === 'string' ? args.options.instruments : undefined, target, io);
    text = taken.raw;
    value = taken.value;
    instrument = taken.instrument;
    record = taken.capture;
  } else {
    text = need('value');
    value = readValue(text, target, { decimalComma: decimalCommaOf(args.options['decimal-comma'], io.env, plan) });
  }
  // An open circuit (OL) is beyond the meter's range, not a figure with a relative error: no guard band.
  const result = verdictFor(target, value, Number.isFinite(value) ? uncertaintyFor(plan, check, target.unit) : undefined);
  const operator = operatorOf(args.options.operator, io.env);

  // A busy board (another bench writing it) is said at once, not after a silent wait.
  const log = await openStore(dir, { onLockWait: (message) => io.stderr(`probebook: ${message}\n`) });
  // A scope record the value was measured from is kept in the log with the reading, as an attached capture is.
  const kept = record ? (await log.saveCapture(record.bytes, record.name)).file : undefined;
  // The skipped-safety warnings are judged under the board's lock, from the run's readings as saved.
  const saved = await log.appendToOpenRun(
    serial,
    { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator },
    {
      check,
      value,
      unit: target.unit,
      raw: text,
      operator,
      verdict: result.verdict,
      planHash: plan.hash,
      ...(result.warnings.length ? { warnings: result.warnings } : {}),
      ...(instrument ? { instrument } : {}),
      ...(kept ? { capture: kept } : {}),
    },
    (board, run) => skippedSafety(set.targets, target, latestVerdicts(board.readings, run.id)),
  );
  if (kept && record) await log.linkCapture(serial, { file: kept, name: record.name, at: saved.reading.at, check, run: saved.run.id });
  const done = latestVerdicts(saved.board.readings, saved.run.id);
  let next = nextCheck(set.targets, done, { check, verdict: result.verdict });
  let ended: RunOutcome | null = null;
  if (target.phase === 'first-power' && result.verdict === 'fail') ended = 'power-off';
  else if (next === null) ended = outcomeOf(done);
  if (ended) await log.endRun(serial, saved.run.id, ended);
  if (ended === 'power-off') next = next ?? { check, why: 'power off: the idle current is above the limit' };

  const outcome: Outcome = {
    reading: saved.reading,
    target,
    deviation: result.deviation,
    uncertainty: result.uncertainty,
    next,
    ended,
    startedRun: saved.startedRun,
  };
  if (args.options.json) {
    const finite = (x: number) => (Number.isFinite(x) ? x : null);
    io.stdout(
      `${JSON.stringify({
        reading: readingJson(saved.reading),
        verdict: result.verdict,
        next: next ? { check: next.check, why: next.why } : null,
        nominal: target.nominal,
        worst: { min: finite(target.worst.min), max: finite(target.worst.max) },
        deviation: target.isLimit ? null : finite(result.deviation),
        uncertainty: result.uncertainty,
        warnings: saved.reading.warnings ?? [],
        runEnded: ended,
      })}\n`,
    );
  } else {
    io.stdout(readable(outcome, serial, log.dir));
  }
  return 0;
};
