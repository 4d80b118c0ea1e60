import type { Reading } from '../../log/types.js';
import type { TimelineEntry } from '../../review/history.js';
import { cell } from '../components/columns.js';
import { formatPercent, formatValue } from '../../units/format.js';
import { verdictMark } from '../theme.js';

/** `2026-11-02 09:01` from an ISO time, in UTC (the screen says so). */
export function shortTime(iso: string): string {
  const ms = Date.parse(iso);
  if (Number.isNaN(ms)) return iso.slice(0, 16);
  return new Date(ms).toISOString().slice(0, 16).replace('T', ' ');
}

/** A reading as `9.02 V ✓ pass`. */
export function readingText(r: Reading): string {
  return `${formatValue(r.value, r.unit)} ${verdictMark[r.verdict]} ${r.verdict}`;
}

/** One timeline row, cut to `width` columns; words and marks, no colour needed. */
export function timelineLine(e: TimelineEntry, width: number): string {
  const time = shortTime(e.at);
  let text: string;
  switch (e.kind) {
    case 'run': {
      const r = e.run;
      const end = r.ended ? r.outcome : 'still open';
      text = `▶ run ${end} · by ${r.operator} · ${r.plan} rev ${r.planHash.slice(0, 8)} · ${r.id}`;
      break;
    }
    case 'reading': {
      const r = e.reading;
      const dev = e.deviation === null ? '' : formatPercent(e.deviation);
      const flags = `${r.capture ? ' ∿' : ''}${r.warnings && r.warnings.length > 0 ? ' !' : ''}`;
      text = `${verdictMark[r.verdict]} ${cell(r.verdict, 8)} ${cell(r.check, 22)} ${cell(formatValue(r.value, r.unit), 12, 'right')} ${cell(dev, 9, 'right')}${flags}`;
      break;
    }
    case 'rework': {
      const w = e.rework;
      text = `↻ rework ${w.part} ${w.from} → ${w.to}${w.note ? `: ${w.note}` : ''} (${w.operator})`;
      break;
    }
    case 'capture':
      text = `∿ capture ${e.capture.name}${e.capture.check ? ` for ${e.capture.check}` : ''} (Enter draws it)`;
      break;
  }
  return cell(`${time}  ${text}`, width);
}
