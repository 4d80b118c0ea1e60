/**
 * Bills of materials as EDA tools export them (RFC 4180 CSV and its usual
 * deviations): comma, semicolon or tab; quoted fields with doubled quotes;
 * CRLF or LF; a UTF-8 byte-order mark; preamble lines before the header. A
 * reference column holds one designator or several (`"R1, R4-R6"`, `R1 R4`).
 */

/** One designator's line of a BOM. */
export interface BomEntry {
  readonly ref: string;
  readonly value: string;
  readonly tol: string | null;
  /** 1-based line of the file. */
  readonly line: number;
}

export interface BomColumns {
  readonly ref?: string;
  readonly value?: string;
  readonly tol?: string;
}

export interface Bom {
  readonly entries: readonly BomEntry[];
  readonly delimiter: ',' | ';' | '\t';
  readonly header: readonly string[];
  /** Lines that could not be read (a designator range that makes no sense, an empty value). */
  readonly problems: readonly { readonly line: number; readonly message: string }[];
}

export class BomError extends Error {
  override readonly name = 'BomError';
}

/** The header names each column is known by (case, spaces and punctuation ignored). */
export const refHeaders = [
  'designator',
  'designators',
  'reference',
  'references',
  'ref',
  'refs',
  'refdes',
  'referencedesignator',
  'referencedesignators',
  'partreference',
  'parts',
];
export const valueHeaders = ['value', 'val', 'comment', 'partvalue', 'values'];
export const tolHeaders = ['tolerance', 'tol', 'tolerances'];

const squash = (h: string) => h.toLowerCase().replace(/[^a-z0-9]/g, '');

/** Split CSV text into rows of fields (RFC 4180 quoting), each with its first line number. */
export function csvRows(text: string, delimiter: string): { fields: string[]; line: number }[] {
  const rows: { fields: string[]; line: number }[] = [];
  let fields: string[] = [];
  let field = '';
  let quoted = false;
  let line = 1;
  let rowLine = 1;
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  for (; i < text.length; i++) {
    const ch = text[i] as string;
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          field += '"';
          i++;
        } else quoted = false;
      } else {
        if (ch === '\n') line++;
        field += ch;
      }
      continue;
    }
    if (ch === '"' && field.trim() === '') {
      quoted = true;
      field = '';
    } else if (ch === delimiter) {
      fields.push(field);
      field = '';
    } else if (ch === '\n' || ch === '\r') {
      if (ch === '\r' && text[i + 1] === '\n') i++;
      fields.push(field);
      rows.push({ fields, line: rowLine });
      fields = [];
      field = '';
      line++;
      rowLine = line;
    } else field += ch;
  }
  if (field !== '' || fields.length > 0) {
    fields.push(field);
    rows.push({ fields, line: rowLine });
  }
  return rows.filter((r) => r.fields.some((f) => f.trim() !== ''));
}

/** The delimiter that gives the header row the most columns among the first lines. */
function sniffDelimiter(text: string): ',' | ';' | '\t' {
  const head = text.slice(0, 4096);
  let best: ',' | ';' | '\t' = ',';
  let bestScore = -1;
  for (const d of [',', ';', '\t'] as const) {
    const rows = csvRows(head, d).slice(0, 12);
    const score = Math.max(
      0,
      ...rows.map((r) => (findColumn(r.fields, refHeaders) >= 0 && findColumn(r.fields, valueHeaders) >= 0 ? 1000 : 0) + r.fields.length),
    );
    if (score > bestScore) {
      best = d;
      bestScore = score;
    }
  }
  return best;
}

function findColumn(header: readonly string[], names: readonly string[], given?: string): number {
  if (given !== undefined) return header.findIndex((h) => squash(h) === squash(given));
  return header.findIndex((h) => names.includes(squash(h)));
}

/**
 * Expand a reference field into designators: separators are commas,
 * semicolons, spaces; `R4-R6` (or `R4-6`) is a range of one prefix.
 */
export function expandRefs(field: string): { refs: string[]; problem?: string } {
  const refs: string[] = [];
  for (const token of field.split(/[\s,;]+/).filter(Boolean)) {
    const range = /^([A-Za-z]+)(\d+)-(?:([A-Za-z]+))?(\d+)$/.exec(token);
    if (range) {
      const [, prefix = '', fromText = '', prefix2, toText = ''] = range;
      const from = Number(fromText);
      const to = Number(toText);
      if ((prefix2 !== undefined && prefix2.toUpperCase() !== prefix.toUpperCase()) || to < from || to - from > 999) {
        return { refs, problem: `${JSON.stringify(token)} is not a range of one prefix (write e.g. R4-R6)` };
      }
      for (let n = from; n <= to; n++) refs.push(`${prefix}${n}`);
    } else if (/^[A-Za-z]+\d+[A-Za-z0-9_]*$/.test(token)) refs.push(token);
    else return { refs, problem: `${JSON.stringify(token)} is not a reference designator (e.g. R17, C7)` };
  }
  return { refs };
}

/** Read a BOM file's text. Throws BomError (one line) when no reference and value columns are found. */
export function parseBom(text: string, columns: BomColumns = {}): Bom {
  const delimiter = sniffDelimiter(text);
  const rows = csvRows(text, delimiter);
  // The header is the first row that names a reference and a value column (preamble lines before it are skipped).
  const headerAt = rows.findIndex((r) => findColumn(r.fields, refHeaders, columns.ref) >= 0 && findColumn(r.fields, valueHeaders, columns.value) >= 0);
  if (headerAt < 0) {
    const named =
      columns.ref || columns.value
        ? ` (asked for ${[columns.ref && `--ref-col ${JSON.stringify(columns.ref)}`, columns.value && `--value-col ${JSON.stringify(columns.value)}`].filter(Boolean).join(', ')})`
        : '';
    throw new BomError(
      `no header with a reference and a value column${named}; known names: ${refHeaders.slice(0, 6).join(', ')} … and ${valueHeaders.join(', ')}; or name them with --ref-col and --value-col`,
    );
  }
  const header = (rows[headerAt] as { fields: string[] }).fields;
  const refCol = findColumn(header, refHeaders, columns.ref);
  const valueCol = findColumn(header, valueHeaders, columns.value);
  const tolCol = findColumn(header, tolHeaders, columns.tol);
  const entries: BomEntry[] = [];
  const problems: { line: number; message: string }[] = [];
  for (const row of rows.slice(headerAt + 1)) {
    const refField = (row.fields[refCol] ?? '').trim();
    const value = (row.fields[valueCol] ?? '').trim();
    const tolText = tolCol >= 0 ? (row.fields[tolCol] ?? '').trim() : '';
    if (refField === '') continue;
    const { refs, problem } = expandRefs(refField);
    if (problem) problems.push({ line: row.line, message: problem });
    for (const ref of refs) entries.push({ ref: ref.toUpperCase(), value, tol: tolText === '' ? null : tolText, line: row.line });
  }
  return { entries, delimiter, header, problems };
}
