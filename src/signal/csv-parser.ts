import { type CsvDialect, detectDialect, unitScale } from './csv-dialect.js';
import { plainValue, scan, scanNumber, scanPlain } from './number-scan.js';
import { type Capture, CaptureError, type ReadOptions } from './types.js';

const LF = 10;
const CR = 13;
const SPACE = 32;
const TAB = 9;
/** Bytes looked at before the dialect is decided. */
const headBytes = 64 * 1024;

function isTimeColumn(name: string, unit: string): boolean {
  return unitScale(unit, 's') !== undefined || /^(time|t|sec|secs|second|seconds|x-axis|x)$/i.test(name.trim());
}

/** A copy with every CR turned into LF. */
function crToLf(bytes: Uint8Array): Uint8Array {
  const out = Uint8Array.from(bytes);
  for (let i = out.indexOf(CR); i >= 0; i = out.indexOf(CR, i + 1)) out[i] = LF;
  return out;
}

/** What a parser of a later part of a file takes from the parser that read its head. */
export interface CsvLayout {
  readonly dialect: CsvDialect;
  /** Index of the time column, −1 when there is none. */
  readonly timeColumn: number;
  readonly bytesPerRow: number;
  readonly isCrOnly: boolean;
}

/** The rows of a part of a file: one array per column (the time column's empty) and the time column's figures. */
export interface CsvPart {
  readonly columns: readonly Float64Array[];
  readonly rows: number;
  /** Lines read, blank ones included. */
  readonly lines: number;
  readonly t0: number;
  readonly tLast: number;
  readonly minStep: number;
  readonly maxStep: number;
}

/**
 * A CSV capture read in chunks straight from bytes: `push` each chunk as it
 * arrives, then `end`. Only the numbers are kept (in Float64Arrays grown
 * geometrically); the file's text is never held as a string.
 */
export class CsvParser {
  private dialect: CsvDialect | undefined;
  private head: Uint8Array[] = [];
  private headLength = 0;
  private tail: Uint8Array = new Uint8Array(0);
  private line = 0;
  /** One array per column (the time column's stays empty), `capacity` rows each; `rows` are filled. */
  private columns: Float64Array[] = [];
  private capacity = 0;
  /** Bytes handed to the parser so far, to extrapolate the row count when the arrays fill. */
  private bytesSeen = 0;
  private timeColumn = -1;
  private delimiter = 44;
  private decimal = 46;
  private expectedRows: number;
  // Time column tracking, without storing it.
  private t0 = Number.NaN;
  private tPrev = Number.NaN;
  private tLast = Number.NaN;
  private minStep = Infinity;
  private maxStep = -Infinity;
  private rows = 0;
  /** Bytes per row in the head, to size the arrays from the file's length. */
  private bytesPerRow = 32;
  /** Whether column 1 was taken as time without a header saying so. */
  private guessedTime = false;
  /** Lines end in a lone CR (classic Mac exports): every CR is read as a line end. */
  private isCrOnly = false;

  constructor(
    private readonly options: ReadOptions,
    /** The file size when known, to size the arrays once. */
    private readonly totalBytes = 0,
  ) {
    this.expectedRows = 0;
  }

  /** Whether the parser has kept none of the chunks it was given (so the caller may reuse its buffer). */
  get isStreaming(): boolean {
    return this.dialect !== undefined;
  }

  push(input: Uint8Array): void {
    const chunk = this.isCrOnly ? crToLf(input) : input;
    this.bytesSeen += chunk.length;
    if (!this.dialect) {
      this.head.push(chunk);
      this.headLength += chunk.length;
      if (this.headLength < headBytes) return;
      this.start(false);
      return;
    }
    this.feed(chunk);
  }

  end(): Capture {
    if (!this.dialect) this.start(true);
    this.flushTail();
    return this.finish();
  }

  /** The last line when the bytes end without a line feed. */
  private flushTail(): void {
    if (this.tail.length > 0) {
      this.parseLine(this.tail, 0, this.tail.length);
      this.tail = new Uint8Array(0);
    }
  }

  /**
   * Columns for the rows the file's length promises. A generous margin costs
   * address space only: pages of a fresh array that are never written are
   * never resident.
   */
  private allocate(): void {
    const d = this.dialect as CsvDialect;
    this.expectedRows = this.totalBytes > 0 ? Math.ceil((this.totalBytes / this.bytesPerRow) * 1.05) + 16 : 1024;
    this.capacity = this.expectedRows;
    for (let i = 0; i < d.columns; i++) this.columns.push(new Float64Array(i === this.timeColumn ? 0 : this.capacity));
  }

  /** The dialect and the column roles once the head is read, for a parser of a later part of the same file (`forPart`). */
  get layout(): CsvLayout | undefined {
    if (!this.dialect) return undefined;
    return { dialect: this.dialect, timeColumn: this.timeColumn, bytesPerRow: this.bytesPerRow, isCrOnly: this.isCrOnly };
  }

  /**
   * A parser for the rows of a part of a file, from a line start on, whose
   * head another parser has read: no dialect detection, no preamble. Its
   * rows go back to that parser through `part` and `absorb`.
   */
  static forPart(options: ReadOptions, layout: CsvLayout, totalBytes: number): CsvParser {
    const parser = new CsvParser(options, totalBytes);
    parser.dialect = layout.dialect;
    parser.delimiter = layout.dialect.delimiter.charCodeAt(0);
    parser.decimal = layout.dialect.decimal.charCodeAt(0);
    parser.timeColumn = layout.timeColumn;
    parser.bytesPerRow = layout.bytesPerRow;
    parser.isCrOnly = layout.isCrOnly;
    parser.allocate();
    return parser;
  }

  /** The rows read by a `forPart` parser (the end of its part is the end of a line or of the file). */
  part(): CsvPart {
    this.flushTail();
    const rows = this.rows;
    return {
      columns: this.columns.map((col, c) => (c === this.timeColumn ? col : col.subarray(0, rows))),
      rows,
      lines: this.line,
      t0: this.t0,
      tLast: this.tLast,
      minStep: this.minStep,
      maxStep: this.maxStep,
    };
  }

  /**
   * Append the rows of the part of the file that follows what this parser has
   * read (which must end at a line end). False, with nothing changed, when the
   * part cannot simply follow (time does not increase across the join): the
   * caller then reads that part here, row by row, for the exact message.
   */
  absorb(part: CsvPart): boolean {
    if (!this.dialect || this.tail.length > 0 || part.columns.length !== this.columns.length) return false;
    if (part.rows === 0) {
      this.line += part.lines;
      return true;
    }
    let step = Number.NaN;
    if (this.timeColumn >= 0 && this.rows > 0) {
      step = part.t0 - this.tPrev;
      if (!(step > 0)) return false;
    }
    const rows = this.rows + part.rows;
    if (rows > this.capacity) this.resize(rows);
    for (let c = 0; c < this.columns.length; c++) if (c !== this.timeColumn) (this.columns[c] as Float64Array).set(part.columns[c] as Float64Array, this.rows);
    if (this.timeColumn >= 0) {
      if (this.rows === 0) this.t0 = part.t0;
      this.minStep = Math.min(this.minStep, part.minStep, Number.isNaN(step) ? Infinity : step);
      this.maxStep = Math.max(this.maxStep, part.maxStep, Number.isNaN(step) ? -Infinity : step);
      this.tPrev = part.tLast;
      this.tLast = part.tLast;
    }
    this.rows = rows;
    this.line += part.lines;
    return true;
  }

  private start(complete: boolean): void {
    let all = concat(this.head, this.headLength);
    this.head = [];
    const name = this.options.name ?? 'capture';
    // CR-only line ends: no LF in the head but CRs. Read each CR as a line end from here on.
    if (all.indexOf(LF) < 0 && all.indexOf(CR) >= 0) {
      this.isCrOnly = true;
      all = crToLf(all);
    }
    const text = new TextDecoder('utf-8').decode(all.subarray(0, Math.min(all.length, headBytes * 2)));
    if (text.includes('\u0000')) throw new CaptureError(`${name}: binary data, not CSV text (and not a WAV file)`);
    const dialect = detectDialect(text.replace(/^\uFEFF/, ''), complete && all.length <= headBytes * 2, name);
    this.dialect = dialect;
    this.delimiter = dialect.delimiter.charCodeAt(0);
    this.decimal = dialect.decimal.charCodeAt(0);
    const dt = this.options.dt ?? dialect.preambleDt;
    if (dialect.columns > 1 || dt === undefined) {
      const t = dialect.names.findIndex((n, i) => isTimeColumn(n, dialect.units[i] ?? ''));
      if (t >= 0) this.timeColumn = t;
      else if (dt === undefined && dialect.columns > 1) {
        this.timeColumn = 0;
        this.guessedTime = true;
      }
    }
    if (this.timeColumn < 0 && dt === undefined) {
      throw new CaptureError(`${name}: one column and no time column; give the sample interval with --dt SECONDS`);
    }
    // Bytes per row from the head, to size the arrays for the whole file at once.
    const headRows = Math.max(1, text.split('\n').length - dialect.skipLines);
    this.bytesPerRow = Math.max(4, Math.min(all.length, headBytes * 2) / headRows);
    this.allocate();
    // Skip a UTF-8 byte-order mark and the preamble lines, then parse the rest of the head as data.
    let pos = all[0] === 0xef && all[1] === 0xbb && all[2] === 0xbf ? 3 : 0;
    for (let skipped = 0; skipped < dialect.skipLines; skipped++) {
      const nl = all.indexOf(LF, pos);
      if (nl < 0) {
        pos = all.length;
        break;
      }
      pos = nl + 1;
      this.line++;
    }
    this.feed(all.subarray(pos));
  }

  private feed(chunk: Uint8Array): void {
    let pos = 0;
    if (this.tail.length > 0) {
      const nl = chunk.indexOf(LF);
      if (nl < 0) {
        this.tail = concat([this.tail, chunk], this.tail.length + chunk.length);
        return;
      }
      const joined = concat([this.tail, chunk.subarray(0, nl + 1)], this.tail.length + nl + 1);
      this.parseLine(joined, 0, joined.length - 1);
      pos = nl + 1;
    }
    const last = chunk.lastIndexOf(LF);
    while (pos <= last) {
      pos = this.fastRows(chunk, pos, last + 1);
      if (pos > last) break;
      // A row the fast path does not take: read (or report) it exactly.
      const nl = chunk.indexOf(LF, pos);
      this.parseLine(chunk, pos, nl);
      pos = nl + 1;
    }
    this.tail = pos < chunk.length ? chunk.slice(pos) : new Uint8Array(0);
  }

  /**
   * The common rows — plain numbers, separators, an optional CR, a line feed —
   * in one pass over the bytes, straight into the column arrays, until `limit`
   * (just after a line feed) or the first row of any other form (a blank line,
   * spaces, quotes, a trailing separator, a bad field, more than 17 digits),
   * whose start it returns for `parseLine` to read or report exactly. Every
   * number is the one `scanNumber` reads from the same bytes. Measured against
   * the earlier row-at-a-time path (scanNumber per field, a push per value):
   * about twice the bytes per second on the bench captures (bench/analyze.bench.ts).
   */
  private fastRows(buf: Uint8Array, start: number, limit: number): number {
    const n = this.columns.length;
    const timeColumn = this.timeColumn;
    if (n === 2 && timeColumn === 0) return this.fastTimeValueRows(buf, start, limit);
    const delimiter = this.delimiter;
    const decimal = this.decimal;
    let columns = this.columns;
    // The per-row state in locals, written back on the way out (fewer loads
    // and stores per row than fields of `this`).
    let rows = this.rows;
    let capacity = this.capacity;
    let tPrev = this.tPrev;
    let minStep = this.minStep;
    let maxStep = this.maxStep;
    let pos = start;
    // The write-back comes first in a two-round loop, so it has run before
    // the row loop is compiled on the stack; otherwise every call left that
    // code at the write-back (seen with --trace-deopt). Round 0 writes the
    // values just read, round 1 the new ones.
    for (let round = 0; ; round++) {
      this.keep(rows, tPrev, minStep, maxStep);
      if (round === 1) break;
      while (pos < limit) {
        if (rows === capacity) {
          this.growAt(rows);
          columns = this.columns;
          capacity = this.capacity;
        }
        const rowStart = pos;
        let t = 0;
        let c = 0;
        for (; c < n; c++) {
          const after = scanPlain(buf, pos, decimal);
          if (after < 0) break; // not a plain number
          const value = plainValue[0] as number;
          const b = buf[after];
          if (c < n - 1) {
            if (b !== delimiter) break;
            pos = after + 1;
          } else if (b === LF) pos = after + 1;
          else if (b === CR && buf[after + 1] === LF) pos = after + 2;
          else break;
          if (c === timeColumn) t = value;
          else (columns[c] as Float64Array)[rows] = value;
        }
        if (c < n) {
          pos = rowStart;
          break;
        }
        if (timeColumn >= 0) {
          if (rows === 0) this.t0 = t;
          else {
            const step = t - tPrev;
            if (!(step > 0)) {
              this.stepError(rows, tPrev, t);
            }
            if (step < minStep) minStep = step;
            if (step > maxStep) maxStep = step;
          }
          tPrev = t;
        }
        rows++;
      }
    }
    return pos;
  }

  /**
   * `fastRows` for the commonest capture, a time and one value per row, with
   * no loop over the columns; same rows taken, same values. Kept apart from
   * `fastRows` for speed: first measured at 0.69–0.70× the general loop's time
   * on the 1 M-row bench capture; measured again (issue 15, after the number
   * scanner's later gains, a busy 2-core machine, interleaved runs): warm
   * 75–77 ms against 76–92 ms, one-shot median 123 ms against 130 ms — a
   * smaller gain than first seen, but a gain, so the two loops stay.
   */
  private fastTimeValueRows(buf: Uint8Array, start: number, limit: number): number {
    const delimiter = this.delimiter;
    const decimal = this.decimal;
    let values = this.columns[1] as Float64Array;
    let rows = this.rows;
    let capacity = this.capacity;
    let tPrev = this.tPrev;
    let minStep = this.minStep;
    let maxStep = this.maxStep;
    let pos = start;
    // The write-back comes first in a two-round loop, so it has run before
    // the row loop is compiled on the stack; otherwise every call left that
    // code at the write-back (seen with --trace-deopt). Round 0 writes the
    // values just read, round 1 the new ones.
    for (let round = 0; ; round++) {
      this.keep(rows, tPrev, minStep, maxStep);
      if (round === 1) break;
      while (pos < limit) {
        if (rows === capacity) {
          this.growAt(rows);
          values = this.columns[1] as Float64Array;
          capacity = this.capacity;
        }
        const a = scanPlain(buf, pos, decimal);
        if (a < 0 || buf[a] !== delimiter) break;
        const t = plainValue[0] as number;
        const b = scanPlain(buf, a + 1, decimal);
        if (b < 0) break;
        const end = buf[b];
        let next: number;
        if (end === LF) next = b + 1;
        else if (end === CR && buf[b + 1] === LF) next = b + 2;
        else break;
        values[rows] = plainValue[0] as number;
        if (rows === 0) this.t0 = t;
        else {
          const step = t - tPrev;
          if (!(step > 0)) {
            this.stepError(rows, tPrev, t);
          }
          if (step < minStep) minStep = step;
          if (step > maxStep) maxStep = step;
        }
        tPrev = t;
        rows++;
        pos = next;
      }
    }
    return pos;
  }

  /** A row loop's state written back from its locals (`rows` rows read so far). */
  private keep(rows: number, tPrev: number, minStep: number, maxStep: number): void {
    this.line += rows - this.rows;
    this.rows = rows;
    this.tPrev = tPrev;
    this.tLast = tPrev;
    this.minStep = minStep;
    this.maxStep = maxStep;
  }

  /** `grow` from a row loop, which holds `rows` rows read so far. */
  private growAt(rows: number): void {
    this.line += rows - this.rows;
    this.rows = rows;
    this.grow();
  }

  /** A row loop's time `t` that does not increase after `tPrev`, `rows` rows before it: throws, naming its line. */
  private stepError(rows: number, tPrev: number, t: number): never {
    this.line += rows - this.rows + 1;
    this.rows = rows;
    this.tPrev = tPrev;
    return this.notIncreasing(t);
  }

  /**
   * More room when the file holds more rows than its head promised: the rows
   * still to come are extrapolated from the bytes per row so far (doubling
   * only when the file's length is unknown), so the arrays are copied rarely.
   */
  private grow(): void {
    const perRow = this.bytesSeen / Math.max(1, this.rows);
    const left = this.totalBytes > this.bytesSeen ? (this.totalBytes - this.bytesSeen) / perRow : 0;
    const next = this.totalBytes > 0 ? Math.ceil(this.rows + left * 1.05 + 1024) : this.capacity * 2;
    this.resize(Math.max(next, this.capacity + 1024));
  }

  /** The columns copied into arrays of `capacity` rows. */
  private resize(capacity: number): void {
    this.capacity = capacity;
    this.columns = this.columns.map((col, c) => {
      if (c === this.timeColumn) return col;
      const bigger = new Float64Array(capacity);
      bigger.set(col.subarray(0, this.rows));
      return bigger;
    });
  }

  /** One line, from `start` to `end` (the line feed, excluded). */
  private parseLine(buf: Uint8Array, start: number, end: number): void {
    this.line++;
    let stop = end;
    while (stop > start && (buf[stop - 1] === CR || buf[stop - 1] === SPACE || buf[stop - 1] === TAB)) stop--;
    if (stop === start) return;
    if (this.rows === this.capacity) this.grow();
    const columns = this.columns;
    const n = columns.length;
    let pos = start;
    for (let c = 0; c < n; c++) {
      const value = scanNumber(buf, pos, stop, this.decimal);
      const after = scan.end;
      if (Number.isNaN(value) || (after < stop && buf[after] !== this.delimiter)) this.rowError(buf, start, stop, c);
      if (after >= stop && c < n - 1) this.rowError(buf, start, stop, c, 'short');
      if (c === this.timeColumn) this.time(value);
      else (columns[c] as Float64Array)[this.rows] = value;
      pos = after + 1;
    }
    // Anything left must be a trailing separator.
    if (pos < stop && !isBlank(buf, pos, stop)) this.rowError(buf, start, stop, n);
    this.rows++;
  }

  private time(t: number): void {
    if (this.rows === 0) this.t0 = t;
    else {
      const step = t - this.tPrev;
      if (!(step > 0)) this.notIncreasing(t);
      if (step < this.minStep) this.minStep = step;
      if (step > this.maxStep) this.maxStep = step;
    }
    this.tPrev = t;
    this.tLast = t;
  }

  /** Throws: time `t` on the current line does not increase after the row before's (`this.tPrev`). */
  private notIncreasing(t: number): never {
    throw new CaptureError(
      `${this.options.name ?? 'capture'}, line ${this.line}: time ${t} does not increase (the row before had ${this.tPrev}); if the file has no time column, give the sample interval with --dt SECONDS`,
    );
  }

  private rowError(buf: Uint8Array, start: number, stop: number, column: number, short?: 'short'): never {
    const text = new TextDecoder().decode(buf.subarray(start, Math.min(stop, start + 60)));
    const d = this.dialect;
    const sep = d?.delimiter === '\t' ? 'tabs' : `"${d?.delimiter ?? ','}"`;
    const what = short
      ? `only ${column + 1} of ${d?.columns} fields`
      : column >= (d?.columns ?? 0)
        ? `more than ${d?.columns} fields`
        : `field ${column + 1} is not a number`;
    throw new CaptureError(
      `${this.options.name ?? 'capture'}, line ${this.line}: ${what} in ${JSON.stringify(text)}; expected ${d?.columns} numbers separated by ${sep} with "${d?.decimal}" as the decimal marker`,
    );
  }

  private finish(): Capture {
    const d = this.dialect as CsvDialect;
    const name = this.options.name ?? 'capture';
    const warnings: string[] = [];
    let dt = this.options.dt;
    if (this.timeColumn >= 0 && dt !== undefined) warnings.push('--dt given: the time column is ignored');
    else if (this.timeColumn >= 0) {
      const scale = unitScale(d.units[this.timeColumn] ?? '', 's') ?? 1;
      if (this.guessedTime) warnings.push(`column 1 (${d.names[0] ?? 'CH1'}) taken as time in seconds; give --dt to read every column as a channel`);
      if (this.rows < 2) throw new CaptureError(`${name}: ${this.rows} row(s); at least 16 samples are needed`);
      dt = ((this.tLast - this.t0) / (this.rows - 1)) * scale;
      if (this.maxStep > this.minStep * 1.1 && (this.maxStep - this.minStep) * scale > 0.01 * dt) {
        warnings.push(
          `time steps vary from ${(this.minStep * scale).toPrecision(3)} s to ${(this.maxStep * scale).toPrecision(3)} s; figures assume the mean step`,
        );
      }
    } else if (dt === undefined) dt = d.preambleDt;
    if (dt === undefined || !(dt > 0) || !Number.isFinite(dt)) throw new CaptureError(`${name}: no usable sample interval; give it with --dt SECONDS`);
    const channels = [];
    for (let c = 0; c < d.columns; c++) {
      if (c === this.timeColumn) continue;
      const samples = (this.columns[c] as Float64Array).subarray(0, this.rows);
      const written = d.units[c] ?? '';
      const scale = unitScale(written, 'V') ?? unitScale(written, 'A');
      if (scale !== undefined && scale !== 1) for (let i = 0; i < samples.length; i++) samples[i] = (samples[i] ?? 0) * scale;
      const unit = scale !== undefined ? (unitScale(written, 'V') !== undefined ? 'V' : 'A') : written === '' ? 'V' : written;
      channels.push({ name: d.names[c] ?? `CH${c + 1}`, unit, samples });
    }
    // 1/dt from a time column carries rounding (200000.00000000003): 12 digits are plenty.
    const sampleRate = Number((1 / dt).toPrecision(12));
    return { channels, sampleRate, dt: 1 / sampleRate, source: `${name} (CSV, ${channels.length} channel${channels.length === 1 ? '' : 's'})`, warnings };
  }
}

function isBlank(buf: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) if (buf[i] !== SPACE && buf[i] !== TAB && buf[i] !== CR) return false;
  return true;
}

/** The parts joined into one array of `length` bytes (the part itself when there is one). */
export function concat(parts: readonly Uint8Array[], length: number): Uint8Array {
  if (parts.length === 1 && parts[0]) return parts[0];
  const out = new Uint8Array(length);
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}
