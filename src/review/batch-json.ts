import type { BatchCheck, BatchFigures } from './batch-types.js';

/** One check as `batch --json` prints it: the contract keys first (DESIGN §7), then ours. */
export function checkJson(c: BatchCheck) {
  return {
    check: c.check,
    n: c.n,
    pass: c.pass,
    marginal: c.marginal,
    fail: c.fail,
    mean: c.mean,
    sd: c.sd,
    min: c.min,
    max: c.max,
    cp: c.cp,
    cpk: c.cpk,
    plan: c.plan,
    unit: c.unit,
    nominal: c.nominal,
    worst: c.band ? { min: c.band.min, max: c.band.max } : null,
    firstPassYield: c.firstPassYield,
    finalYield: c.finalYield,
    status: c.status,
    note: c.note,
    bandRevision: c.bandRevision,
    bandsDiffer: c.bandsDiffer,
    outliers: c.outliers.map((o) => ({ serial: o.serial, value: o.value, at: o.at, reasons: o.reasons, z: o.z })),
  };
}

/** The whole `batch --json` document. */
export function batchJson(f: BatchFigures, filter: string) {
  return {
    checks: f.checks.map(checkJson),
    boards: f.boards,
    firstPassYield: f.firstPassYield,
    finalYield: f.finalYield,
    incomplete: f.incomplete,
    filter,
    problems: f.problems.map((p) => p.message),
  };
}
