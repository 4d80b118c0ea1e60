import { crc32 } from 'node:zlib';
import type { Verdict } from '../analysis/types.js';
import type { CheckMap } from './index-journal.js';
import type { CheckColumns } from './types.js';

/**
 * `index-checks.<gen>.bin`: every board's per-check summaries (first and latest
 * reading of each check) as columns of numbers, written with the index snapshot.
 * The batch review reads all of them at once; as JSON they took ~190 bytes and
 * three objects per board and check, and parsing them was most of a batch over
 * 10,000 boards (measured in bench/review.bench.ts). Here a check whose first
 * reading is also its latest (most of them) costs 23 bytes, and the reader
 * takes typed-array views of the file without building one object per check.
 *
 * Layout, little-endian, each column starting on an 8-byte boundary:
 *   magic "PBCK", format u32, crc32 u32 of every byte after the first 16, header length u32,
 *   header (UTF-8 JSON: serials, check ids, row counts, times that are not
 *   canonical ISO 8601 text by slot), then the columns
 *   latestValue f64[rows], latestAt f64[rows] (ms since epoch, NaN: the text is in the header),
 *   firstValue f64[firsts], firstAt f64[firsts], rowStart u32[boards + 1],
 *   checkOf u32[rows], count u32[rows], firstRow u32[firsts], verdicts u8[rows]
 *   (latest | first << 2). Rows whose first reading differs from the latest
 *   (count > 1) keep the first in the `first*` columns, found through `firstRow`.
 * Anything else (a torn, truncated or foreign file) reads as null: the index is
 * a cache, and the caller rebuilds it from the board files.
 */
const magic = 0x4b434250; // "PBCK" read as a little-endian u32
const format = 1;
const headBytes = 16;

const verdictCode: Readonly<Record<Verdict, number>> = { pass: 0, marginal: 1, fail: 2 };
const verdictName: readonly Verdict[] = ['pass', 'marginal', 'fail'];

interface Header {
  readonly serials: string[];
  readonly checks: string[];
  readonly rows: number;
  readonly firsts: number;
  /** Times kept as text (`l<row>` latest, `f<first>` first): any that `toISOString` would not give back. */
  readonly texts: Record<string, string>;
}

/** Milliseconds of an ISO time when the number gives the same text back, else NaN (the text is kept). */
function timeOf(at: string): number {
  const ms = Date.parse(at);
  if (Number.isNaN(ms) || at.length !== 24) return Number.NaN;
  return new Date(ms).toISOString() === at ? ms : Number.NaN;
}

const align8 = (n: number) => (n + 7) & ~7;

/** The file's bytes for these boards' check maps, in the given board order. */
export function encodeCheckColumns(boards: Iterable<[serial: string, checks: CheckMap]>): Uint8Array {
  const serials: string[] = [];
  const checks: string[] = [];
  const checkAt = new Map<string, number>();
  const rowStart: number[] = [0];
  const latestValue: number[] = [];
  const latestAt: number[] = [];
  const firstValue: number[] = [];
  const firstAt: number[] = [];
  const checkOf: number[] = [];
  const count: number[] = [];
  const firstRow: number[] = [];
  const verdicts: number[] = [];
  const texts: Record<string, string> = {};
  for (const [serial, map] of boards) {
    serials.push(serial);
    for (const check in map) {
      const c = map[check];
      if (!c) continue;
      const row = latestValue.length;
      let id = checkAt.get(check);
      if (id === undefined) {
        id = checks.length;
        checks.push(check);
        checkAt.set(check, id);
      }
      checkOf.push(id);
      count.push(c.count);
      latestValue.push(c.latest.value);
      const lt = timeOf(c.latest.at);
      if (Number.isNaN(lt)) texts[`l${row}`] = c.latest.at;
      latestAt.push(lt);
      verdicts.push(verdictCode[c.latest.verdict] | (verdictCode[c.first.verdict] << 2));
      const isSame = c.first.at === c.latest.at && Object.is(c.first.value, c.latest.value) && c.first.verdict === c.latest.verdict;
      if (!isSame) {
        const k = firstRow.length;
        firstRow.push(row);
        firstValue.push(c.first.value);
        const ft = timeOf(c.first.at);
        if (Number.isNaN(ft)) texts[`f${k}`] = c.first.at;
        firstAt.push(ft);
      }
    }
    rowStart.push(latestValue.length);
  }
  const header: Header = { serials, checks, rows: latestValue.length, firsts: firstRow.length, texts };
  const headerBytes = Buffer.from(JSON.stringify(header), 'utf8');
  const rows = header.rows;
  const firsts = header.firsts;
  const bodyStart = align8(headBytes + headerBytes.length);
  const layout = columnLayout(bodyStart, serials.length, rows, firsts);
  const out = new Uint8Array(layout.end);
  const view = new DataView(out.buffer);
  view.setUint32(0, magic, true);
  view.setUint32(4, format, true);
  view.setUint32(12, headerBytes.length, true);
  out.set(headerBytes, headBytes);
  new Float64Array(out.buffer, layout.latestValue, rows).set(latestValue);
  new Float64Array(out.buffer, layout.latestAt, rows).set(latestAt);
  new Float64Array(out.buffer, layout.firstValue, firsts).set(firstValue);
  new Float64Array(out.buffer, layout.firstAt, firsts).set(firstAt);
  new Uint32Array(out.buffer, layout.rowStart, serials.length + 1).set(rowStart);
  new Uint32Array(out.buffer, layout.checkOf, rows).set(checkOf);
  new Uint32Array(out.buffer, layout.count, rows).set(count);
  new Uint32Array(out.buffer, layout.firstRow, firsts).set(firstRow);
  out.set(verdicts, layout.verdicts);
  view.setUint32(8, crc32(out.subarray(headBytes)), true);
  return out;
}

function columnLayout(start: number, boards: number, rows: number, firsts: number) {
  const latestValue = start;
  const latestAt = latestValue + 8 * rows;
  const firstValue = latestAt + 8 * rows;
  const firstAt = firstValue + 8 * firsts;
  const rowStart = firstAt + 8 * firsts;
  const checkOf = align8(rowStart + 4 * (boards + 1));
  const count = align8(checkOf + 4 * rows);
  const firstRow = align8(count + 4 * rows);
  const verdicts = align8(firstRow + 4 * firsts);
  return { latestValue, latestAt, firstValue, firstAt, rowStart, checkOf, count, firstRow, verdicts, end: verdicts + rows };
}

/** The columns of a file's bytes, or null when they are not a whole, intact file of this format. */
export function decodeCheckColumns(bytes: Uint8Array): CheckColumns | null {
  if (bytes.length < headBytes) return null;
  // Typed-array views need their element alignment; a pooled Buffer may not give it.
  const data = bytes.byteOffset % 8 === 0 ? bytes : new Uint8Array(bytes);
  const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
  if (view.getUint32(0, true) !== magic || view.getUint32(4, true) !== format) return null;
  if (crc32(data.subarray(headBytes)) !== view.getUint32(8, true)) return null;
  const headerLength = view.getUint32(12, true);
  if (headBytes + headerLength > data.length) return null;
  let header: Header;
  try {
    header = JSON.parse(Buffer.from(data.buffer, data.byteOffset + headBytes, headerLength).toString('utf8')) as Header;
  } catch {
    return null;
  }
  if (
    !Array.isArray(header.serials) ||
    !Array.isArray(header.checks) ||
    !Number.isInteger(header.rows) ||
    !Number.isInteger(header.firsts) ||
    typeof header.texts !== 'object' ||
    header.texts === null
  )
    return null;
  const boards = header.serials.length;
  const layout = columnLayout(align8(headBytes + headerLength), boards, header.rows, header.firsts);
  if (layout.end !== data.length) return null;
  const at = (offset: number) => data.byteOffset + offset;
  return columnsOver(header, {
    latestValue: new Float64Array(data.buffer, at(layout.latestValue), header.rows),
    latestAt: new Float64Array(data.buffer, at(layout.latestAt), header.rows),
    firstValue: new Float64Array(data.buffer, at(layout.firstValue), header.firsts),
    firstAt: new Float64Array(data.buffer, at(layout.firstAt), header.firsts),
    rowStart: new Uint32Array(data.buffer, at(layout.rowStart), boards + 1),
    checkOf: new Uint32Array(data.buffer, at(layout.checkOf), header.rows),
    count: new Uint32Array(data.buffer, at(layout.count), header.rows),
    firstRow: new Uint32Array(data.buffer, at(layout.firstRow), header.firsts),
    verdicts: new Uint8Array(data.buffer, at(layout.verdicts), header.rows),
  });
}

interface Arrays {
  readonly latestValue: Float64Array;
  readonly latestAt: Float64Array;
  readonly firstValue: Float64Array;
  readonly firstAt: Float64Array;
  readonly rowStart: Uint32Array;
  readonly checkOf: Uint32Array;
  readonly count: Uint32Array;
  readonly firstRow: Uint32Array;
  readonly verdicts: Uint8Array;
}

function columnsOver(header: Header, a: Arrays): CheckColumns | null {
  const boardOf = new Map<string, number>();
  for (let i = 0; i < header.serials.length; i++) {
    boardOf.set(header.serials[i] ?? '', i);
    if ((a.rowStart[i] ?? 0) > (a.rowStart[i + 1] ?? -1)) return null;
  }
  if (a.rowStart[0] !== 0 || a.rowStart[header.serials.length] !== header.rows) return null;
  const firstOf = new Map<number, number>();
  for (let k = 0; k < a.firstRow.length; k++) firstOf.set(a.firstRow[k] ?? -1, k);
  const checkCount = header.checks.length;
  for (let r = 0; r < header.rows; r++) {
    if ((a.checkOf[r] ?? checkCount) >= checkCount || (a.verdicts[r] ?? 0xff) & 0xf0 || ((a.verdicts[r] ?? 0) & 3) > 2 || (a.verdicts[r] ?? 0) >> 2 > 2)
      return null;
  }
  const text = (key: string, ms: number): string => header.texts[key] ?? new Date(ms).toISOString();
  const latestAtText = (row: number) => text(`l${row}`, a.latestAt[row] ?? Number.NaN);
  return {
    checkIds: header.checks,
    checkOf: a.checkOf,
    latestValue: a.latestValue,
    latestAtMs: a.latestAt,
    verdicts: a.verdicts,
    rowsOf(serial) {
      const b = boardOf.get(serial);
      return b === undefined ? -1 : b;
    },
    rowStart: a.rowStart,
    latestAt: latestAtText,
    checksOf(serial) {
      const b = boardOf.get(serial);
      if (b === undefined) return null;
      const map: CheckMap = {};
      for (let r = a.rowStart[b] ?? 0; r < (a.rowStart[b + 1] ?? 0); r++) {
        const v = a.verdicts[r] ?? 0;
        const latest = { value: a.latestValue[r] ?? Number.NaN, verdict: verdictName[v & 3] ?? 'fail', at: latestAtText(r) };
        const k = firstOf.get(r);
        const first =
          k === undefined
            ? { ...latest }
            : { value: a.firstValue[k] ?? Number.NaN, verdict: verdictName[v >> 2] ?? 'fail', at: text(`f${k}`, a.firstAt[k] ?? Number.NaN) };
        map[header.checks[a.checkOf[r] ?? 0] ?? ''] = { first, latest, count: a.count[r] ?? 1 };
      }
      return map;
    },
  };
}

/** The verdict of a `verdicts` code's latest (`code & 3`) or first (`code >> 2`) part. */
export function verdictOfCode(code: number): Verdict {
  return verdictName[code] ?? 'fail';
}
