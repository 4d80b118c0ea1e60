import type { BatchFigures } from './batch-types.js';

/** The CSV columns: the `batch --json` contract keys, then the extras a quality engineer files. */
export const batchCsvColumns = [
  'check',
  'n',
  'pass',
  'marginal',
  'fail',
  'mean',
  'sd',
  'min',
  'max',
  'cp',
  'cpk',
  'plan',
  'unit',
  'nominal',
  'worst_min',
  'worst_max',
  'first_pass_yield',
  'final_yield',
  'status',
  'outliers',
] as const;

/**
 * One field per RFC 4180 §2: quoted when it holds a comma, a quote or a line
 * break, with inner quotes doubled. Numbers keep every digit (`String(x)`
 * round-trips a double), so the file parses back to the same figures as the
 * JSON; an empty field stands for "no figure".
 */
export function csvField(value: string | number | null): string {
  if (value === null) return '';
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The batch report as CSV, lines ended with CRLF (RFC 4180 §2.1), plan order. */
export function batchCsv(f: BatchFigures): string {
  const lines = [batchCsvColumns.join(',')];
  for (const c of f.checks) {
    const row: (string | number | null)[] = [
      c.check,
      c.n,
      c.pass,
      c.marginal,
      c.fail,
      c.mean,
      c.sd,
      c.min,
      c.max,
      c.cp,
      c.cpk,
      c.plan,
      c.unit,
      c.nominal,
      c.band?.min ?? null,
      c.band?.max ?? null,
      c.firstPassYield,
      c.finalYield,
      c.status,
      c.outliers.map((o) => o.serial).join(' '),
    ];
    lines.push(row.map(csvField).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}
