import { partWithRef } from '../plan/refs.js';
import type { Target, TargetSet } from '../analysis/types.js';
import { formatValue } from '../units/format.js';
import { formatPrefixes } from '../units/prefix.js';
import type { Unit } from '../units/unit.js';

/** Both ends of a band with one prefix and one unit: `5.881 … 6.121 V`. */
export function formatBand(min: number, max: number, unit: Unit): string {
  if (Number.isNaN(min) || Number.isNaN(max)) return '—';
  if (min === -Infinity && max === Infinity) return 'any';
  if (max === Infinity) return `≥ ${formatValue(min, unit)}`;
  if (min === -Infinity) return `≤ ${formatValue(max, unit)}`;
  if (unit === '1') return `${mantissa(min * 100)} … ${mantissa(max * 100)} %`;
  if (unit === 'V/V') return `${mantissa(min)} … ${mantissa(max)} V/V`;
  if (unit === 'V/s') return `${mantissa(min / 1e6)} … ${mantissa(max / 1e6)} V/µs`;
  const big = Math.max(Math.abs(min), Math.abs(max));
  if (big === 0) return `0 … 0 ${unit}`;
  const exponent = Math.max(-15, Math.min(12, Math.floor(Math.log10(big) / 3) * 3));
  const prefix = formatPrefixes.find(([p]) => p === exponent)?.[1] ?? '';
  const scale = 10 ** exponent;
  // An end that is zero but for rounding (a stage that stops at a corner) reads as 0.
  const tidy = (v: number) => (Math.abs(v) < 1e-6 * big ? 0 : v);
  return `${mantissa(tidy(min) / scale)} … ${mantissa(tidy(max) / scale)} ${prefix}${unit}`;
}

function mantissa(v: number): string {
  const text = Math.abs(v) >= 1000 ? v.toFixed(0) : v.toPrecision(4);
  return text.includes('.') && !text.includes('e') ? text.replace(/\.?0+$/, '') : text;
}

/** The mark after a worst-case band: how it was bound (see `Target.method`). */
const methodMark: Readonly<Record<NonNullable<Target['method']>, string>> = { corners: '(c)', monotone: '(m)', search: '(s)' };

function nominalText(t: Target): string {
  if (t.phase === 'unpowered') return `≥ ${formatValue(t.worst.min, t.unit)}`;
  if (t.phase === 'first-power') return Number.isFinite(t.worst.max) ? `≤ ${formatValue(t.worst.max, t.unit)}` : 'no limit';
  return formatValue(t.nominal, t.unit);
}

function contributorText(t: Target, refs: ReadonlyMap<string, string>): string {
  const top = t.contributors[0];
  if (top) return `${partWithRef(top.part, refs)} ${Math.round(top.share * 100)}%`;
  return t.phase === 'stage' && t.worst.max - t.worst.min > 1e-9 * Math.abs(t.nominal) ? 'as written' : '';
}

function fitCell(text: string, width: number): string {
  const chars = [...text];
  return chars.length > width ? `${chars.slice(0, width - 1).join('')}…` : text + ' '.repeat(width - chars.length);
}

/** Lines of text are kept to this many columns. */
const tableWidth = 100;

/** Word-wrap `text` to `width` columns, with a first-line and a hanging indent. */
export function wrap(text: string, width: number, first: string, rest: string): string[] {
  const lines: string[] = [];
  let line = first;
  let fresh = true;
  for (const word of text.split(/\s+/)) {
    if (!fresh && [...line].length + 1 + [...word].length > width) {
      lines.push(line);
      line = rest + word;
    } else line = fresh ? line + word : `${line} ${word}`;
    fresh = false;
  }
  lines.push(line);
  return lines;
}

export interface TableHeader {
  readonly title: string;
  readonly file: string;
  readonly trials: number;
  readonly seed: number;
  readonly distribution: string;
  readonly note?: string;
  /** Reference designators by part, to name the top contributor as on the board. */
  readonly refs?: ReadonlyMap<string, string>;
}

/**
 * The readable `targets` output: a header, one row per check (check, test
 * point, nominal, worst-case band, statistical band, top contributor) in safe
 * bring-up order, the design warnings, and the first-power caution. About 100
 * columns wide; long check ids are shortened with an ellipsis.
 */
export function targetsTable(set: TargetSet, header: TableHeader): string {
  // A design figure has no test point to probe: its TP column says so.
  const rows = set.targets.map((t) => [
    t.check,
    t.isDesignFigure ? 'design' : (t.testPoint ?? ''),
    nominalText(t),
    `${formatBand(t.worst.min, t.worst.max, t.unit)}${t.method ? ` ${methodMark[t.method]}` : ''}`,
    t.phase === 'stage' || t.phase === 'rails' ? formatBand(t.stat.min, t.stat.max, t.unit) : '',
    contributorText(t, header.refs ?? new Map()),
  ]);
  const heads = ['check', 'TP', 'nominal', 'worst-case band', 'statistical band', 'top contributor'];
  const caps = [26, 6, 12, 24, 22, 20];
  const widths = heads.map((h, c) => Math.min(caps[c] ?? 20, Math.max([...h].length, ...rows.map((r) => [...(r[c] ?? '')].length))));
  const line = (cells: readonly string[]): string =>
    cells
      .map((cell, c) => fitCell(cell, widths[c] ?? 10))
      .join('  ')
      .trimEnd();
  const out: string[] = [];
  out.push(`${header.title} (plan ${set.plan}, ${header.file})`);
  const spread = header.distribution === 'normal' ? 'parts normal (tol = 3σ, truncated)' : 'parts uniform';
  if (header.note) out.push(...wrap(header.note, tableWidth, '', ''));
  out.push(`Monte Carlo: ${header.trials} trials, seed ${header.seed}, ${spread}`);
  out.push('Worst-case band: over every part tolerance, bound by every corner (c), the sensitivity corner checked');
  out.push('part by part (m), or a search of the box for checks that do not move one way with every part (s);');
  out.push('statistical band: 0.135–99.865 % of trials');
  out.push('');
  out.push(line(heads));
  out.push(line(widths.map((w) => '─'.repeat(w))));
  let phase = '';
  for (const [i, t] of set.targets.entries()) {
    if (t.phase !== phase && i > 0) out.push('');
    phase = t.phase;
    out.push(line(rows[i] ?? []));
  }
  out.push('');
  if (set.targets.some((t) => t.isDesignFigure)) {
    out.push(
      ...wrap('TP "design": a design figure, worked out from the parts but not probed at a test point; the bring-up does not ask for it.', tableWidth, '', ''),
    );
    out.push('');
  }
  if (set.warnings.length === 0) out.push('No design warnings.');
  else {
    out.push(`Design warnings (${set.warnings.length}):`);
    for (const w of set.warnings) out.push(...wrap(`${w.stage}: ${w.message}`, tableWidth - 2, '  ', '    '));
  }
  out.push('');
  const caution =
    'Caution: check the rails to ground with the power off first; apply first power through a current-limited supply set near the idle limit; mind hot parts and charged capacitors. Local codes and licensed practice come first.';
  out.push(...wrap(caution, tableWidth, '', ''));
  return `${out.join('\n')}\n`;
}
