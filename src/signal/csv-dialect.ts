import { CaptureError } from './types.js';

/** How a CSV capture is written, as found from its first lines. */
export interface CsvDialect {
  /** Field separator: `,`, `;` or a tab. */
  readonly delimiter: ',' | ';' | '\t';
  /** Decimal marker: `.` or `,` (the latter only with `;` or tab separators). */
  readonly decimal: '.' | ',';
  /** Lines before the first row of numbers (preamble and header). */
  readonly skipLines: number;
  /** Numbers per row. */
  readonly columns: number;
  /** Column names from the header line, or `CH1`, `CH2`… */
  readonly names: readonly string[];
  /** Unit of each column as written (`V`, `mV`, `s`), `''` when none. */
  readonly units: readonly string[];
  /** Sample interval found in the preamble (`Sample Interval,1e-6`), s. */
  readonly preambleDt?: number;
}

const numberText = {
  '.': /^\s*"?[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"?\s*$/,
  ',': /^\s*"?[+-]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][+-]?\d+)?"?\s*$/,
};

const candidates: readonly { delimiter: CsvDialect['delimiter']; decimal: CsvDialect['decimal'] }[] = [
  { delimiter: ',', decimal: '.' },
  { delimiter: ';', decimal: '.' },
  { delimiter: '\t', decimal: '.' },
  { delimiter: ';', decimal: ',' },
  { delimiter: '\t', decimal: ',' },
];

/**
 * Separators and other characters a line holds, as bits, so that a candidate
 * dialect can be ruled out for a line without splitting it or running the
 * number pattern: a `,`, `;` or `.` that is neither the candidate's separator
 * nor its decimal marker, or any other ASCII character the number pattern
 * never takes, makes the line no row of numbers under that candidate.
 * Characters outside ASCII (some are spaces to the pattern) rule nothing out.
 * The same answers as `isNumericRow` alone (test/signal/csv-dialect-filter.test.ts).
 * Measured on the 1 M-row bench capture's 128 KB head (5,000 lines), eight
 * interleaved fresh processes on a busy 2-core machine: the detection's first
 * call median 22 ms against 28 ms without the filter, a second call 5 against
 * 12 ms (the time went on trying the four wrong candidates on every line).
 */
const hasComma = 1;
const hasSemicolon = 2;
const hasDot = 4;
const hasOther = 8;
/** An ASCII character the number pattern never takes (digits, sign, exponent, quote, white space as \s has it, and the separators are taken). */
const otherAscii = /[\0-\x08\x0e-\x1f!#-*/:<-DF-df-\x7f]/;

/** The bits of a line; through native string searches, which are fast even before the code is compiled (a loop over the characters took longer than the patterns it spares). */
export function lineMask(line: string): number {
  return (
    (line.includes(',') ? hasComma : 0) | (line.includes(';') ? hasSemicolon : 0) | (line.includes('.') ? hasDot : 0) | (otherAscii.test(line) ? hasOther : 0)
  );
}

/** Whether a line of this mask may be a row of numbers under the candidate (false: it is not). */
export function mayBeNumericRow(mask: number, delimiter: string, decimal: '.' | ','): boolean {
  let allowed = 0;
  for (const ch of [delimiter, decimal]) allowed |= ch === ',' ? hasComma : ch === ';' ? hasSemicolon : ch === '.' ? hasDot : 0;
  return (mask & ~allowed & (hasComma | hasSemicolon | hasDot | hasOther)) === 0;
}

export function isNumericRow(line: string, delimiter: string, decimal: '.' | ','): number {
  let fields = line.split(delimiter);
  // A separator at the end of every row (`1.0,2.0,`) leaves an empty last field.
  if (fields.length > 1 && fields[fields.length - 1]?.trim() === '') fields = fields.slice(0, -1);
  const pattern = numberText[decimal];
  return fields.every((f) => pattern.test(f)) ? fields.length : 0;
}

/**
 * Find the dialect from the first lines of a file. `complete` says whether the
 * text is the whole file (else its last line may be cut and is ignored).
 */
export function detectDialect(text: string, complete: boolean, name: string): CsvDialect {
  const lines = text.split('\n').map((l) => l.replace(/\r$/, ''));
  if (!complete) lines.pop();
  if (lines.length === 0) {
    throw new CaptureError(`${name}: no line end in the first ${Math.round(text.length / 1024)} KB (one endless line); is this a capture exported as CSV?`);
  }
  let best: { score: number; columns: number; start: number; c: (typeof candidates)[number] } | undefined;
  const masks = lines.map(lineMask);
  for (const c of candidates) {
    // The first row of numbers, then how many of the following rows agree with it.
    const start = lines.findIndex(
      (l, i) => mayBeNumericRow(masks[i] ?? 0, c.delimiter, c.decimal) && l.trim() !== '' && isNumericRow(l, c.delimiter, c.decimal) > 0,
    );
    if (start < 0) continue;
    const columns = isNumericRow(lines[start] ?? '', c.delimiter, c.decimal);
    let score = 0;
    for (let i = start; i < lines.length && i < start + 200; i++) {
      const l = lines[i] ?? '';
      if (l.trim() === '') continue;
      if (isNumericRow(l, c.delimiter, c.decimal) === columns) score++;
      else break;
    }
    // A header with as many names as the rows have numbers settles a tie
    // between `;` with decimal commas and `,` splitting every number in two.
    // (Only a header free of the other separators counts: `Time (s),V` is not
    // one name under `;`.)
    const header = findHeader(lines, start, c.delimiter, columns);
    const others = [',', ';', '\t'].filter((d) => d !== c.delimiter);
    if (header && !others.some((d) => header.join(c.delimiter).includes(d))) score += 1e6;
    if (!best || score > best.score || (score === best.score && columns > best.columns)) best = { score, columns, start, c };
  }
  if (!best) {
    throw new CaptureError(`${name}: no rows of numbers in the first ${lines.length} lines; is this a capture exported as CSV?`);
  }
  const { c, columns, start } = best;
  const names: string[] = [];
  const units: string[] = [];
  const header = findHeader(lines, start, c.delimiter, columns);
  const clean = (f: string | undefined): string => f?.trim().replace(/^"|"$/g, '') ?? '';
  // Some exports put the units on a line of their own under the names (`X,CH1` then `Second,Volt`).
  const unitLine = header && header.every((f) => unitNames.test(clean(f))) ? header : undefined;
  const nameLine = unitLine ? findHeader(lines, start - 1 - blankBefore(lines, start), c.delimiter, columns) : header;
  for (let i = 0; i < columns; i++) {
    const { label, unit } = splitUnit(clean(nameLine?.[i]));
    names.push(label !== '' ? label : `CH${i + 1}`);
    units.push(unitLine ? unitSymbol(clean(unitLine[i])) : unit);
  }
  const preambleDt = findPreambleDt(lines.slice(0, start));
  return {
    delimiter: c.delimiter,
    decimal: c.decimal,
    skipLines: start,
    columns,
    names,
    units,
    ...(preambleDt !== undefined ? { preambleDt } : {}),
  };
}

/** Blank lines right before line `start`. */
function blankBefore(lines: readonly string[], start: number): number {
  let n = 0;
  while (start - 1 - n >= 0 && (lines[start - 1 - n] ?? '').trim() === '') n++;
  return n;
}

const unitNames = /^(s|sec|second|seconds|ms|us|µs|ns|v|volt|volts|mv|uv|µv|a|amp|amps|ma)$/i;

/** `Second` → `s`, `Volt` → `V`; a symbol stays as written. */
function unitSymbol(word: string): string {
  const lower = word.toLowerCase();
  if (/^(sec|second|seconds)$/.test(lower)) return 's';
  if (/^(volt|volts)$/.test(lower)) return 'V';
  if (/^(amp|amps)$/.test(lower)) return 'A';
  return word;
}

function findHeader(lines: readonly string[], start: number, delimiter: string, columns: number): string[] | undefined {
  for (let i = start - 1; i >= 0; i--) {
    const l = lines[i] ?? '';
    if (l.trim() === '') continue;
    let fields = l.split(delimiter);
    if (fields.length === columns + 1 && fields[columns]?.trim() === '') fields = fields.slice(0, columns);
    return fields.length === columns ? fields : undefined;
  }
  return undefined;
}

const unitWords = /^(s|ms|us|µs|μs|ns|ps|V|mV|uV|µV|μV|kV|A|mA|uA|µA|μA|Hz|kHz)$/i;

/** `Time (s)`, `CH1 [V]`, `CH2/mV`, `CH3 mV` → label and unit. */
function splitUnit(raw: string): { label: string; unit: string } {
  const bracket = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(raw);
  if (bracket) return { label: (bracket[1] ?? '').trim(), unit: (bracket[2] ?? '').trim() };
  const slash = /^(.*?)\s*\/\s*(\S+)$/.exec(raw);
  if (slash && unitWords.test(slash[2] ?? '')) return { label: (slash[1] ?? '').trim(), unit: slash[2] ?? '' };
  const word = /^(.*?)\s+(\S+)$/.exec(raw);
  if (word && unitWords.test(word[2] ?? '')) return { label: (word[1] ?? '').trim(), unit: word[2] ?? '' };
  if (unitWords.test(raw)) return { label: raw, unit: raw };
  return { label: raw, unit: '' };
}

const dtLine =
  /^\s*"?(?:sample[ _-]?interval|sampling[ _-]?interval|interval|dt|x[ _-]?increment|xinc)"?\s*[,;:\t=]\s*"?([-+]?[\d.,]+(?:[eE][-+]?\d+)?)\s*(s|ms|us|µs|μs|ns)?"?/i;

function findPreambleDt(preamble: readonly string[]): number | undefined {
  for (const l of preamble) {
    const m = dtLine.exec(l);
    if (!m) continue;
    const value = Number((m[1] ?? '').replace(',', '.'));
    const scale = unitScale(m[2] ?? 's', 's');
    if (Number.isFinite(value) && value > 0 && scale !== undefined) return value * scale;
  }
  return undefined;
}

/**
 * The factor from a written unit to SI (`mV` → 1e-3), when it is a unit of
 * `base` (`V`, `s`, `A`); undefined otherwise. SI prefixes per the BIPM SI
 * Brochure, 9th edition (2019).
 */
export function unitScale(unit: string, base: 'V' | 's' | 'A'): number | undefined {
  const u = unit.trim();
  if (u === '') return undefined;
  const lower = u.toLowerCase();
  const b = base.toLowerCase();
  if (!lower.endsWith(b)) return undefined;
  const prefix = u.slice(0, u.length - 1);
  const scales: Readonly<Record<string, number>> = { '': 1, k: 1e3, m: 1e-3, u: 1e-6, µ: 1e-6, μ: 1e-6, n: 1e-9, p: 1e-12 };
  return scales[prefix] ?? (prefix === 'K' ? 1e3 : undefined);
}
