import { markdownText } from '../units/text.js';
import type { BatchFigures } from './batch-types.js';
import { weakestFirst } from './batch.js';
import { cpkWord, formatFigure, formatIndex, formatPercent } from './format.js';

export interface MarkdownOptions {
  /** What the batch covers, in words. */
  readonly filter: string;
  /** When the report was made (ISO 8601). */
  readonly generated: string;
  /** The log folder, for traceability. */
  readonly logDir: string;
}

function md(text: string): string {
  return markdownText(text);
}

/** The batch report a quality engineer can file, as Markdown; weakest check first. */
export function batchMarkdown(f: BatchFigures, o: MarkdownOptions): string {
  const out: string[] = [];
  out.push('# Batch review', '');
  out.push(`- Covers: ${md(o.filter)}`);
  out.push(`- Generated: ${o.generated}`);
  out.push(`- Log: \`${o.logDir}\``);
  out.push(`- Boards: ${f.boards}${f.incomplete > 0 ? ` (${f.incomplete} not yet through every check)` : ''}`);
  out.push(`- First-pass yield: ${formatPercent(f.firstPassYield)} (${f.firstPassBoards} of ${f.boards} boards passed every check at the first reading)`);
  out.push(`- Final yield: ${formatPercent(f.finalYield)} (${f.finalPassBoards} of ${f.boards} boards pass every check at the latest reading)`);
  out.push(
    '',
    'Figures use the latest reading of each check on each board. Cp and Cpk are taken against the worst-case band of the newest plan revision measured; Cpk of 1.33 or more is the usual aim.',
    '',
  );
  out.push('| check | n | pass | marginal | fail | first-pass | final | mean | sd | min | max | band | Cp | Cpk | |');
  out.push('| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- | ---: | ---: | --- |');
  const sorted = [...f.checks].sort(weakestFirst);
  for (const c of sorted) {
    const band = c.band ? `${formatFigure(c.band.min, c.unit)} … ${formatFigure(c.band.max, c.unit)}` : '—';
    const word = c.status === 'ok' ? cpkWord(c.cpk) : 'not enough data';
    out.push(
      `| ${md(c.check)} | ${c.n} | ${c.pass} | ${c.marginal} | ${c.fail} | ${formatPercent(c.firstPassYield)} | ${formatPercent(c.finalYield)} | ${formatFigure(c.mean, c.unit)} | ${formatFigure(c.sd, c.unit, 3)} | ${formatFigure(c.min, c.unit)} | ${formatFigure(c.max, c.unit)} | ${band} | ${formatIndex(c.cp)} | ${formatIndex(c.cpk)} | ${word} |`,
    );
  }
  const notes = sorted.filter((c) => c.note !== '' || c.bandsDiffer);
  if (notes.length > 0) {
    out.push('', '## Notes', '');
    for (const c of notes) {
      if (c.note !== '') out.push(`- ${md(c.check)}: ${md(c.note)}`);
      if (c.bandsDiffer) out.push(`- ${md(c.check)}: boards of older plan revisions were judged against a different band`);
    }
  }
  const outliers = sorted.flatMap((c) => c.outliers.map((x) => ({ c, x })));
  out.push('', '## Outlier boards', '');
  if (outliers.length === 0) out.push('None: every latest reading lies inside its band and within 3σ of the mean.');
  for (const { c, x } of outliers.slice(0, 200)) {
    out.push(
      `- ${md(x.serial)} — ${md(c.check)} = ${formatFigure(x.value, c.unit)} (${x.reasons.join(', ')}${x.z !== null ? `, z = ${x.z.toFixed(1)}` : ''}), ${x.at}`,
    );
  }
  if (outliers.length > 200) out.push(`- … and ${outliers.length - 200} more (see the CSV)`);
  if (f.problems.length > 0) {
    out.push('', '## Problems', '');
    for (const p of f.problems) out.push(`- ${md(p.message)}`);
  }
  return `${out.join('\n')}\n`;
}
