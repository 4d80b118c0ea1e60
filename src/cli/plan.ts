import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { applyEdits, modify } from 'jsonc-parser';
import { BomError, parseBom } from '../plan/bom.js';
import { reconcileBom } from '../plan/bom-reconcile.js';
import { PlanError } from '../plan/errors.js';
import { checkPlanText, loadPlanFile } from '../plan/load.js';
import { parseArgs } from './args.js';
import type { Command, CommandIo } from './command.js';
import { UsageError } from './errors.js';
import { savePlanText } from './plan-save.js';

const usage =
  'probebook plan new FILE | plan check PLAN [--json] | plan bom PLAN BOM.csv [--write] [--json] [--ref-col NAME] [--value-col NAME] [--tol-col NAME]';

const help = `usage:
  probebook plan new FILE            the plan editor (a screen) on a new or existing plan
  probebook plan check PLAN [--json] every problem of a plan at once, each with its JSON
                                     path and remedy; exit 2 when there is any
  probebook plan bom PLAN BOM.csv [--write] [--json]
      reconcile a bill of materials with the plan's reference designators ("refs" of
      each stage, e.g. {"Ct": "C7", "clamp": "D3/D4"}): every value that differs,
      refs only in the plan or only in the BOM, BOM values that cannot be read.
      --write updates the plan's values (keeping each part's tolerance unless the BOM
      gives one), only if the result loads; the old file is kept as PLAN.bak.
      The BOM: comma, semicolon or tab separated, quoted fields, a header row (lines
      before it are skipped) naming a reference column (Designator, Reference, Ref,
      RefDes, Parts…), a value column (Value, Val, Comment) and optionally a tolerance
      column (Tolerance, Tol) in any case; or name them with --ref-col, --value-col,
      --tol-col. A reference cell may hold several refs: "R1, R4-R6" or "R1 R4".
`;

async function readText(file: string, what: string, cwd: string): Promise<string> {
  try {
    return await readFile(resolve(cwd, file), 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new UsageError(`${what} ${file}: ${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a folder' : `cannot be read (${code})`}`);
  }
}

async function planCheck(argv: readonly string[], io: CommandIo): Promise<number> {
  const args = parseArgs(argv, { options: { json: 'boolean', help: 'boolean' }, positionals: [1, 1], usage: 'probebook plan check PLAN [--json]' });
  if (args.options.help) {
    io.stdout(help);
    return 0;
  }
  const file = args.positionals[0] as string;
  const text = await readText(file, 'plan', io.cwd);
  const problems = checkPlanText(text, file);
  if (args.options.json) {
    io.stdout(`${JSON.stringify({ plan: file, ok: problems.length === 0, problems: problems.map((p) => ({ path: p.path, message: p.detail })) })}\n`);
  } else if (problems.length === 0) {
    const plan = await loadPlanFile(file, { cwd: io.cwd });
    io.stdout(
      `plan ${file} loads: ${plan.stages.length} stage${plan.stages.length === 1 ? '' : 's'}, ${plan.rails.length} rail${plan.rails.length === 1 ? '' : 's'}; no problems\n`,
    );
  } else {
    for (const p of problems) io.stdout(`${p.message}\n`);
    io.stdout(`${problems.length} problem${problems.length === 1 ? '' : 's'}\n`);
  }
  return problems.length === 0 ? 0 : 2;
}

async function planBom(argv: readonly string[], io: CommandIo): Promise<number> {
  const args = parseArgs(argv, {
    options: { write: 'boolean', json: 'boolean', help: 'boolean', 'ref-col': 'string', 'value-col': 'string', 'tol-col': 'string' },
    positionals: [2, 2],
    usage: 'probebook plan bom PLAN BOM.csv [--write] [--json]',
  });
  if (args.options.help) {
    io.stdout(help);
    return 0;
  }
  const [planFile, bomFile] = args.positionals as [string, string];
  const plan = await loadPlanFile(planFile, { cwd: io.cwd });
  const col = (name: string) => (typeof args.options[name] === 'string' ? (args.options[name] as string) : undefined);
  let bom;
  try {
    bom = parseBom(await readText(bomFile, 'BOM', io.cwd), {
      ...(col('ref-col') ? { ref: col('ref-col') as string } : {}),
      ...(col('value-col') ? { value: col('value-col') as string } : {}),
      ...(col('tol-col') ? { tol: col('tol-col') as string } : {}),
    });
  } catch (error) {
    if (error instanceof BomError) throw new UsageError(`BOM ${bomFile}: ${error.message}`);
    throw error;
  }
  const report = reconcileBom(plan, bom);
  let written = 0;
  if (args.options.write && report.differences.length > 0) {
    let text = plan.text;
    for (const d of report.differences) text = applyEdits(text, modify(text, [...d.path], d.write, { formattingOptions: { insertSpaces: true, tabSize: 2 } }));
    savePlanText(resolve(io.cwd, planFile), text, planFile);
    written = report.differences.length;
  }
  if (args.options.json) {
    io.stdout(
      `${JSON.stringify({
        plan: planFile,
        bom: bomFile,
        differences: report.differences.map((d) => ({ ref: d.ref, part: d.part, plan: d.plan, bom: d.bom, write: d.write })),
        same: report.same,
        onlyInPlan: report.onlyInPlan.map((r) => ({ ref: r.ref, part: `${r.stage}.${r.role}` })),
        onlyInBom: report.onlyInBom.map((e) => ({ ref: e.ref, value: e.value, line: e.line })),
        unreadable: report.unreadable,
        written,
      })}\n`,
    );
    return 0;
  }
  const lines: string[] = [
    `plan ${planFile} against BOM ${bomFile}: ${report.same} part${report.same === 1 ? '' : 's'} agree, ${report.differences.length} differ`,
  ];
  for (const d of report.differences) lines.push(`  differs      ${d.part} (${d.ref}): plan ${JSON.stringify(d.plan)}, BOM ${d.bom}`);
  for (const r of report.onlyInPlan) lines.push(`  only in plan ${r.stage}.${r.role} (${r.ref})`);
  for (const e of report.onlyInBom) lines.push(`  only in BOM  ${e.ref} ${JSON.stringify(e.value)} (line ${e.line})`);
  for (const u of report.unreadable) lines.push(`  unreadable   ${u.ref ? `${u.ref} ` : ''}line ${u.line}: ${u.message}`);
  if (written) lines.push(`wrote ${written} value${written === 1 ? '' : 's'} into ${planFile} (the old file kept as ${planFile}.bak)`);
  else if (report.differences.length && !args.options.write) lines.push('run again with --write to update the plan');
  io.stdout(`${lines.join('\n')}\n`);
  return 0;
}

/** `probebook plan …` (DESIGN §7b). */
export const planCommand: Command = async (argv, io) => {
  const [sub, ...rest] = argv;
  if (sub === undefined || sub === '--help' || sub === '-h') {
    io.stdout(help);
    return sub === undefined ? 2 : 0;
  }
  if (sub === 'check') return planCheck(rest, io);
  if (sub === 'bom') {
    try {
      return await planBom(rest, io);
    } catch (error) {
      if (error instanceof PlanError && rest.includes('--write')) throw error;
      throw error;
    }
  }
  if (sub === 'new') {
    const { planNewCommand } = await import('./plan-new.js');
    return planNewCommand(rest, io);
  }
  throw new UsageError(`unknown plan command ${JSON.stringify(sub)}; usage: ${usage}`);
};
