// Write the demo bench log: INVENTED board histories for the demo plans, so every
// screen has something real to show. No board, serial, reading or person here
// exists; the values are drawn around the targets of our own invented plans.
//
//   node --import tsx demo/make-demo-log.ts DIR [--plans exciter.plan.json,line-driver.plan.json,calibrator.plan.json]
//
// Everything goes through the real store (`openLog`) and the real target engine
// (`computeTargets`, `verdictFor`, `explainReading`), as the bench screen writes
// it. The script's clock is shifted so the runs spread over invented days in
// November 2026 instead of all landing on the minute the script runs.
import { existsSync, readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { diagnose } from '../src/analysis/diagnose.js';
import { explainReading } from '../src/analysis/explain.js';
import { buildChain, type ChainFault } from '../src/plan/chain.js';
import { computeTargets } from '../src/analysis/targets.js';
import type { Target, Verdict } from '../src/analysis/types.js';
import { uncertaintyFor, verdictFor } from '../src/analysis/verdict.js';
import { openLog } from '../src/log/store.js';
import type { BenchLog } from '../src/log/types.js';
import { loadPlanFile, loadPlanText } from '../src/plan/load.js';
import type { Plan } from '../src/plan/types.js';
import { parseValue } from '../src/units/parse.js';
import { type Unit, uncertaintyKey } from '../src/units/unit.js';
import { uncertaintyOf } from '../src/units/uncertainty.js';

// ---- a seeded PRNG (mulberry32) and a shifted clock: the same demo every time

function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const random = prng(20261102);
/** A standard normal deviate (Box–Muller). */
const gauss = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());

/** Shift `Date` so the store stamps invented times; real time still flows, so lock timeouts work. */
function demoClock(start: number) {
  const RealDate = Date;
  let virtual = start;
  let realAt = RealDate.now();
  const now = () => virtual + (RealDate.now() - realAt);
  class DemoDate extends RealDate {
    constructor(...a: unknown[]) {
      if (a.length === 0) super(now());
      else super(...(a as [string]));
    }
    static override now() {
      return now();
    }
  }
  globalThis.Date = DemoDate as unknown as DateConstructor;
  const set = (ms: number) => {
    virtual = ms;
    realAt = RealDate.now();
  };
  return {
    advance: (minutes: number) => set(now() + minutes * 60_000),
    /** The next board: 20–70 minutes on, or the next working morning after 16:00 UTC. */
    nextBoard: () => {
      const t = new RealDate(now() + (20 + 50 * random()) * 60_000);
      if (t.getUTCHours() >= 16) {
        t.setUTCDate(t.getUTCDate() + (t.getUTCDay() === 5 ? 3 : 1));
        t.setUTCHours(7, 30 + Math.floor(random() * 30), 0, 0);
      }
      set(t.getTime());
    },
  };
}
const clock = demoClock(Date.UTC(2026, 10, 2, 7, 40));

/** `2.153k`, `158.2u`: four significant digits with an SI prefix, as read off a display. */
function engineering(value: number): string {
  if (value === 0) return '0';
  const exponent = Math.max(-9, Math.min(6, Math.floor(Math.log10(Math.abs(value)) / 3) * 3));
  const prefix: Readonly<Record<number, string>> = { 6: 'M', 3: 'k', 0: '', [-3]: 'm', [-6]: 'u', [-9]: 'n' };
  return `${Number((value / 10 ** exponent).toPrecision(4))}${prefix[exponent] ?? ''}`;
}

/** How a technician types a value: `12.02`, `-11.95V`, `2.153k`, `23.4m`, `1.10%`. */
function typed(value: number, unit: Unit): string {
  switch (unit) {
    case 'V':
      // A bench meter shows volts with two or three decimals.
      return Math.abs(value) < 1 ? value.toFixed(3) : `${value.toFixed(2)}${random() < 0.3 ? 'V' : ''}`;
    case '1':
      return `${(value * 100).toFixed(2)}%`;
    default:
      return engineering(value);
  }
}

// ---- boards

const operators = ['R. Okafor', 'M. Lindqvist', 'S. Petrova'];

interface Board {
  readonly log: BenchLog;
  readonly plan: Plan;
  readonly targets: readonly Target[];
  readonly serial: string;
  readonly operator: string;
  readonly run: string;
}

function target(b: Board, check: string): Target {
  const t = b.targets.find((x) => x.check === check);
  if (!t) throw new Error(`plan ${b.plan.plan} has no check ${check}`);
  return t;
}

/** A value a good board reads: near the middle of the statistical band. */
function goodValue(t: Target): number {
  if (t.phase === 'unpowered') return Math.round(4_000 + random() * 40_000);
  if (t.phase === 'first-power') return t.worst.max * (0.45 + 0.2 * random());
  const half = (t.stat.max - t.stat.min) / 2;
  const centre = (t.stat.max + t.stat.min) / 2;
  return centre + half * Math.max(-0.8, Math.min(0.8, 0.35 * gauss()));
}

/** Save one reading as typed; returns its verdict. */
async function read(b: Board, check: string, value: number, minutes = 1.5): Promise<Verdict> {
  const t = target(b, check);
  clock.advance(minutes * (0.6 + 0.8 * random()));
  const raw = typed(value, t.unit);
  const parsed = parseValue(raw, { expected: t.unit, allowTolerance: false });
  if (!parsed.ok) throw new Error(`the demo typed ${raw} for ${check}, which does not parse: ${parsed.message}`);
  const verdict = verdictFor(t, parsed.value, uncertaintyFor(b.plan, check, uncertaintyKey(t.unit))).verdict;
  await b.log.appendReading(b.serial, { run: b.run, check, value: parsed.value, unit: t.unit, raw, operator: b.operator, verdict, planHash: b.plan.hash });
  return verdict;
}

/** Good readings for the checks from `from` up to (not including) `until`, in bring-up order. */
async function readGood(b: Board, from?: string, until?: string): Promise<void> {
  const start = from ? b.targets.findIndex((t) => t.check === from) : 0;
  const end = until ? b.targets.findIndex((t) => t.check === until) : b.targets.length;
  for (const t of b.targets.slice(Math.max(0, start), end < 0 ? b.targets.length : end)) {
    // Design figures (a peak base current) have no test point: nobody reads them at the bench.
    if (t.isDesignFigure) continue;
    let verdict = await read(b, t.check, goodValue(t));
    // A stray marginal from the random draw is probed again, as a technician would;
    // not on a band too narrow for any reading to pass (a zero-width band).
    const u = uncertaintyOf(t.nominal, uncertaintyFor(b.plan, t.check, uncertaintyKey(t.unit)) ?? { relative: 0, absolute: 0 });
    const canPass = t.worst.max - t.worst.min > 2 * u;
    for (let i = 0; canPass && verdict !== 'pass' && i < 3; i++) verdict = await read(b, t.check, t.nominal + (goodValue(t) - t.nominal) * 0.3, 0.5);
  }
}

function after(b: Board, check: string): string | undefined {
  return b.targets[b.targets.findIndex((t) => t.check === check) + 1]?.check;
}

async function newBoard(log: BenchLog, plan: Plan, targets: readonly Target[], serial: string): Promise<Board> {
  clock.nextBoard();
  const operator = operators[Math.floor(random() * operators.length)] ?? 'R. Okafor';
  const run = await log.startRun(serial, { plan: plan.plan, planHash: plan.hash, planText: plan.text, operator });
  return { log, plan, targets, serial, operator, run: run.id };
}

// ---- the script

const args = process.argv.slice(2);
const dir = args[0];
if (!dir || dir.startsWith('--')) {
  console.error('usage: make-demo-log.ts DIR [--plans exciter.plan.json,line-driver.plan.json,calibrator.plan.json]');
  process.exit(2);
}
const plansAt = args.indexOf('--plans');
const planFiles = plansAt >= 0 ? (args[plansAt + 1] ?? '').split(',') : ['demo/exciter.plan.json', 'demo/line-driver.plan.json', 'demo/calibrator.plan.json'];
if (existsSync(resolve(dir, 'boards')) && readdirSync(resolve(dir, 'boards')).length > 0) {
  console.error(`make-demo-log: ${dir} already holds boards; give an empty or new folder`);
  process.exit(2);
}

const log = await openLog(dir);
const [exciter, lineDriver, calibrator] = await Promise.all(planFiles.map((f) => loadPlanFile(f)));
if (!exciter) throw new Error('make-demo-log: no plan given');
const exciterTargets = computeTargets(exciter).targets;
const written: string[] = [];

// Five exciter boards that pass first time.
for (let n = 101; n <= 105; n++) {
  const b = await newBoard(log, exciter, exciterTargets, `EXB-0${n}`);
  await readGood(b);
  await log.endRun(b.serial, b.run, 'passed');
  written.push(`${b.serial} passed`);
}

// EXB-0106: the timing capacitor came from the wrong reel (a decade too large).
// The frequency reads a decade low, the explanation names the capacitor, it is
// replaced, and the frequency and everything after it are measured again.
const osc = exciter.stages.find((s) => s.kind === 'schmitt-integrator');
const ct = osc?.parts.Ct;
if (osc && ct) {
  const b = await newBoard(log, exciter, exciterTargets, 'EXB-0106');
  const freq = `${osc.id}.freq`;
  const nano = (f: number) => `${Number((f * 1e9).toPrecision(3))}n`;
  const wrongText = exciter.text.replace(JSON.stringify(ct.text), JSON.stringify(`${nano(ct.nominal * 10)} ${Math.round(ct.tol * 100)}%`));
  const wrongFreq = target({ ...b, targets: computeTargets(loadPlanText(wrongText, 'exciter-x10-ct'), { trials: 200 }).targets }, freq);
  await readGood(b, undefined, freq);
  const low = wrongFreq.nominal * (1 + 0.004 * gauss());
  if ((await read(b, freq, low)) !== 'fail') throw new Error('the ×10 capacitor should fail the frequency');
  const top = explainReading(exciter, freq, low)[0];
  if (top?.part !== `${osc.id}.Ct`) console.warn(`make-demo-log: the low frequency is explained by ${top?.part ?? 'nothing'}, not ${osc.id}.Ct`);
  clock.advance(25);
  await log.addRework(b.serial, {
    run: b.run,
    part: `${osc.id}.Ct`,
    from: nano(ct.nominal * 10),
    to: nano(ct.nominal),
    note: `fitted ${nano(ct.nominal * 10)} from the wrong reel; replaced with ${nano(ct.nominal)} (invented demo event)`,
    operator: b.operator,
  });
  await readGood(b, freq);
  await log.endRun(b.serial, b.run, 'passed');
  written.push(`${b.serial} wrong Ct found, reworked, passed`);
}

// EXB-0107: the driver's output swings only one way (an output transistor open);
// the run fails there, a rework is noted, the board waits for its re-test.
const driver = exciter.stages.find((s) => s.kind === 'push-pull');
if (driver) {
  const b = await newBoard(log, exciter, exciterTargets, 'EXB-0107');
  const vpp = `${driver.id}.out.vpp`;
  await readGood(b, undefined, vpp);
  await read(b, vpp, target(b, vpp).nominal * (0.5 + 0.02 * random()));
  await log.endRun(b.serial, b.run, 'failed');
  clock.advance(90);
  await log.addRework(b.serial, {
    run: b.run,
    part: `${driver.id}.Q2`,
    from: 'open',
    to: 'new part',
    note: 'lower output transistor open; replaced, re-test pending (invented demo event)',
    operator: b.operator,
  });
  written.push(`${b.serial} driver failed, reworked, awaiting re-test`);
}

// EXB-0108: one marginal reading (probe ground lead too long), re-probed: passes.
{
  const b = await newBoard(log, exciter, exciterTargets, 'EXB-0108');
  const edge = exciterTargets.find((t) => t.phase === 'stage' && t.unit === 'V' && Number.isFinite(t.worst.max));
  if (edge) {
    await readGood(b, undefined, edge.check);
    const u = uncertaintyOf(edge.worst.max, uncertaintyFor(exciter, edge.check, uncertaintyKey(edge.unit)) ?? { relative: 0, absolute: 0 });
    await read(b, edge.check, edge.worst.max + Math.max(u * 0.5, (edge.worst.max - edge.worst.min) * 0.002));
    await readGood(b, edge.check);
  } else await readGood(b);
  await log.endRun(b.serial, b.run, 'passed');
  written.push(`${b.serial} one marginal re-probed, passed`);
}

// EXB-0109: on the bench now: the safety checks and the first stage readings done.
{
  const b = await newBoard(log, exciter, exciterTargets, 'EXB-0109');
  const firstStage = exciterTargets.find((t) => t.phase === 'stage');
  await readGood(b, undefined, firstStage ? after(b, after(b, firstStage.check) ?? firstStage.check) : undefined);
  written.push(`${b.serial} in progress`);
}

// Three exciter boards with one planted fault each, of the commonest kinds (invented
// events). Their stage readings are what the plan's own model predicts for the faulted
// board, read with a bench instrument's scatter and rounding; the run stops failed and
// \`probebook diagnose\` names the part.
const exciterPlan: Plan = exciter;
async function faultyBoard(serial: string, what: string, change: { part?: string; value?: number; fault?: ChainFault }): Promise<void> {
  const chain = buildChain(exciterPlan);
  const x = Float64Array.from(chain.nominal);
  if (change.part) x[chain.variables.findIndex((v) => v.name === change.part)] = change.value ?? Number.NaN;
  const predicted = chain.detail(x, undefined, change.fault).values;
  const b = await newBoard(log, exciterPlan, exciterTargets, serial);
  const firstStage = exciterTargets.find((t) => t.phase === 'stage');
  await readGood(b, undefined, firstStage?.check);
  for (const t of exciterTargets.filter((u) => u.phase === 'stage')) {
    const p = predicted[t.check];
    // A stopped oscillator or a flat output reads as nothing: 0 on the counter or the scope.
    const value = p === undefined || !Number.isFinite(p) ? 0 : p * (1 + 0.002 * gauss());
    await read(b, t.check, value);
  }
  await log.endRun(b.serial, b.run, 'failed');
  const board = await log.readBoard(serial);
  const top = diagnose(exciterPlan, exciterTargets, board?.readings ?? [], { top: 3 }).hypotheses;
  const planted = change.fault ? `${change.fault.stage}.${change.fault.role}` : change.part;
  if (!top.some((h) => h.part === planted || h.alternatives.some((a) => a.part === planted)))
    console.warn(`make-demo-log: ${serial}: the diagnosis does not list ${planted} in its top 3`);
  written.push(`${serial} ${what}, failed, awaiting diagnosis`);
}
const clampStage = exciter.stages.find((s) => s.id === 'osc' && 'clamp' in (s.refs ?? {}));
if (clampStage) {
  await faultyBoard('EXB-0110', 'high-side zener of the clamp pair fitted backwards', { fault: { stage: 'osc', role: 'clamp', mode: 'reversed', variant: 0 } });
  if (ct) await faultyBoard('EXB-0111', 'timing capacitor a decade low (1n fitted for 10n)', { part: 'osc.Ct', value: ct.nominal / 10 });
  const rf = exciter.stages.find((s) => s.id === 'gain')?.parts['Rf'];
  if (rf) await faultyBoard('EXB-0112', 'gain-stage feedback resistor one E24 step high (16k for 15k)', { part: 'gain.Rf', value: 16_000 });
}

// Line-driver boards: three pass; one fails its crossover dead band and stays failed.
if (lineDriver) {
  const ldTargets = computeTargets(lineDriver).targets;
  for (let n = 201; n <= 203; n++) {
    const b = await newBoard(log, lineDriver, ldTargets, `LDR-0${n}`);
    await readGood(b);
    await log.endRun(b.serial, b.run, 'passed');
    written.push(`${b.serial} passed`);
  }
  const dead = ldTargets.find((t) => t.check.endsWith('.deadband'));
  const b = await newBoard(log, lineDriver, ldTargets, 'LDR-0204');
  if (dead) {
    await readGood(b, undefined, dead.check);
    await read(b, dead.check, Number.isFinite(dead.worst.max) ? dead.worst.max * 1.6 : dead.nominal * 2);
    await readGood(b, after(b, dead.check));
  } else await readGood(b);
  await log.endRun(b.serial, b.run, 'failed');
  written.push(`${b.serial} failed`);
}

// Calibrator boards (two, so the whole demo list still fits an 80×24 bench screen):
// one passes; on the other the reference zener went in back to front (it reads a
// forward drop), is turned round and passes.
if (calibrator) {
  const calTargets = computeTargets(calibrator).targets;
  for (let n = 301; n <= 301; n++) {
    const b = await newBoard(log, calibrator, calTargets, `CAL-0${n}`);
    await readGood(b);
    await log.endRun(b.serial, b.run, 'passed');
    written.push(`${b.serial} passed`);
  }
  const zener = calibrator.stages.find((s) => s.module.faults?.(s.settings).some((f) => f.modes.includes('reversed') && f.role === 'Z'));
  if (zener) {
    const b = await newBoard(log, calibrator, calTargets, 'CAL-0302');
    const dc = `${zener.id}.out.dc`;
    await readGood(b, undefined, dc);
    // A silicon junction's forward drop at a few mA (common practice): what a zener fitted backwards reads.
    if ((await read(b, dc, 0.71 + 0.01 * gauss())) !== 'fail') throw new Error('a reversed zener should fail the reference level');
    clock.advance(20);
    await log.addRework(b.serial, {
      run: b.run,
      part: `${zener.id}.Z`,
      from: 'reversed',
      to: 'turned round',
      note: 'reference zener fitted with its band at the ground end; turned round (invented demo event)',
      operator: b.operator,
    });
    await readGood(b, dc);
    await log.endRun(b.serial, b.run, 'passed');
    written.push(`${b.serial} reversed zener found, reworked, passed`);
  }
}

await log.readIndex();
console.log(`make-demo-log: ${written.length} invented boards in ${resolve(dir)}:\n  ${written.join('\n  ')}`);
