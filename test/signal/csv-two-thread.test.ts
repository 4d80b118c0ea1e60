import { parse } from 'csv-parse/sync';
import { closeSync, mkdtempSync, openSync, readSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { CsvParser } from '../../src/signal/csv-parser.js';
import { blockBounds, readRestTwoThreads } from '../../src/signal/csv-part.js';
import { readCaptureFile } from '../../src/signal/read-capture.js';
import type { Capture } from '../../src/signal/types.js';

// A large CSV capture is read by two threads (src/signal/csv-part.ts): these
// check that the result is the one thread's to the last bit, that the worker
// really read blocks, and that a bad row or a time step anywhere in the
// worker's blocks is reported exactly as one thread reports it.
const dir = mkdtempSync(join(tmpdir(), 'probebook-two-thread-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Small blocks so a test file of ~2 MB has many; the last 3 kept for the worker so it always reads some. */
const tuning = { fromBytes: 0, blockBytes: 16 * 1024, reserve: 3 };
const oneThread = { twoThread: { fromBytes: Number.POSITIVE_INFINITY } };

/** An invented capture: rows of every form the parser knows (fast rows, spaces, quotes, 17 digits, CRLF, blank lines), one time step irregular. */
function mixedCsv(rows: number, columns: 2 | 3): string {
  const lines = [columns === 3 ? 'Time (s),CH1 (V),CH2 (mV)' : 'Time (s),CH1 (V)'];
  const third = (text: string): string => (columns === 3 ? `,${text}` : '');
  for (let i = 0; i < rows; i++) {
    // One step of 1.5 µs among 1 µs steps: the "time steps vary" warning must survive the join.
    const t = i < rows - 500 ? `${(i * 1e-6).toExponential(9)}` : `${((i + 0.5) * 1e-6).toExponential(9)}`;
    const v = (Math.round(Math.sin(i / 10) * 1e6) / 1e6).toString();
    if (i % 997 === 0) lines.push(` ${t}, "${v}" ${third(String(i % 5))}`);
    else if (i % 1009 === 0) lines.push(`${t},${Math.sin(i).toPrecision(17)}${third(String(i % 5))}`);
    else if (i % 1013 === 0) lines.push(`${t},${v}${third(String(i % 5))}\r`);
    else lines.push(`${t},${v}${third(String(i % 7))}`);
    if (i % 4999 === 0) lines.push('');
  }
  return `${lines.join('\n')}\n`;
}

function write(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

function sameCapture(a: Capture, b: Capture): void {
  expect(a.sampleRate).toBe(b.sampleRate);
  expect(a.warnings).toEqual(b.warnings);
  expect(a.channels.map((c) => [c.name, c.unit, c.samples.length])).toEqual(b.channels.map((c) => [c.name, c.unit, c.samples.length]));
  for (let c = 0; c < a.channels.length; c++) {
    const x = a.channels[c]?.samples ?? new Float64Array(0);
    const y = b.channels[c]?.samples ?? new Float64Array(0);
    // Bit for bit: the same bytes through the same parser.
    expect(Buffer.from(x.buffer, x.byteOffset, x.byteLength).equals(Buffer.from(y.buffer, y.byteOffset, y.byteLength))).toBe(true);
  }
}

/** Read the head like readCaptureFile, then the rest with two threads; returns the capture and how many worker blocks were joined. */
async function twoThreadRead(path: string, size: number, headBytes: number): Promise<{ capture: Capture; joined: number }> {
  const parser = new CsvParser({ name: 'two.csv' }, size);
  const fd = openSync(path, 'r');
  try {
    const head = new Uint8Array(headBytes);
    const got = readSync(fd, head, 0, headBytes, 0);
    parser.push(head.subarray(0, got));
    expect(parser.isStreaming).toBe(true);
    const joined = await readRestTwoThreads(fd, path, parser, got, size, { name: 'two.csv' }, tuning);
    return { capture: parser.end(), joined };
  } finally {
    closeSync(fd);
  }
}

describe('a CSV capture read by two threads', () => {
  test.each([2, 3] as const)('gives exactly the one-thread capture, the worker joining its blocks (%i columns)', async (columns) => {
    const text = mixedCsv(80_000, columns);
    const path = write(`mixed-${columns}.csv`, text);
    const one = (await readCaptureFile(path, oneThread)).capture;
    const { capture, joined } = await twoThreadRead(path, Buffer.byteLength(text), 100_000);
    // The three reserved blocks at least came from the worker thread.
    expect(joined).toBeGreaterThanOrEqual(3);
    sameCapture(capture, one);
    expect(capture.warnings.join(' ')).toMatch(/time steps vary/);
    // And through readCaptureFile as the command calls it.
    sameCapture((await readCaptureFile(path, { twoThread: tuning })).capture, one);
    // Both agree with an independent CSV library and Number() (csv-parse, correctly rounded parsing, ECMA-262 §7.1.4.1.1).
    const rows = (parse(text, { from_line: 2, skip_empty_lines: true, trim: true }) as string[][]).map((r) => r.map((f) => Number(f.replace(/"/g, ''))));
    const samples = one.channels[0]?.samples ?? new Float64Array(0);
    expect(samples.length).toBe(rows.length);
    let worst = 0;
    for (let i = 0; i < rows.length; i++) {
      const want = rows[i]?.[1] ?? 0;
      worst = Math.max(worst, Math.abs((samples[i] ?? Number.NaN) - want) / Math.max(1e-300, Math.abs(want)));
    }
    // Up to 15 digits exact, 17 within a few ulps (src/signal/number-scan.ts).
    expect(worst).toBeLessThan(1e-15);
  });

  test('a bad row in the worker’s blocks is named with its true line, as one thread names it', async () => {
    const lines = mixedCsv(80_000, 2).split('\n');
    lines[lines.length - 40] = '0.07999,1.2.3';
    const path = write('bad-row.csv', lines.join('\n'));
    const expected = await readCaptureFile(path, oneThread).then(
      () => 'no error',
      (e: Error) => e.message,
    );
    expect(expected).toMatch(/^bad-row\.csv, line \d+: field 2 is not a number in "0\.07999,1\.2\.3"/);
    await expect(readCaptureFile(path, { twoThread: tuning })).rejects.toThrow(expected);
  });

  test('time that does not increase across the join of two blocks is named as one thread names it', async () => {
    const text = mixedCsv(80_000, 2);
    const path = write('join.csv', text);
    const fd = openSync(path, 'r');
    const bounds = blockBounds(fd, 100_000, Buffer.byteLength(text), tuning.blockBytes);
    closeSync(fd);
    expect(bounds?.length).toBeGreaterThan(6);
    // The first row of the last block gets the time of the row before it (same length, so the blocks stay where they were).
    const at = bounds?.[(bounds?.length ?? 0) - 2] ?? 0;
    const before = text.lastIndexOf('\n', at - 2) + 1;
    const previousTime = text.slice(before, text.indexOf(',', before)).trim();
    const ownTime = text.slice(at, text.indexOf(',', at));
    expect(previousTime.length).toBe(ownTime.length);
    const broken = `${text.slice(0, at)}${previousTime}${text.slice(at + ownTime.length)}`;
    writeFileSync(path, broken);
    const expected = await readCaptureFile(path, oneThread).then(
      () => 'no error',
      (e: Error) => e.message,
    );
    expect(expected).toMatch(new RegExp(`does not increase \\(the row before had ${Number(previousTime)}\\)`));
    await expect(twoThreadRead(path, Buffer.byteLength(broken), 100_000)).rejects.toThrow(expected.replace('join.csv', 'two.csv'));
  });

  test('a file too small to cut, or with lines too long to find, is left to one thread', async () => {
    const text = mixedCsv(2000, 2);
    const path = write('small.csv', text);
    const parser = new CsvParser({ name: 'small.csv' }, Buffer.byteLength(text));
    const fd = openSync(path, 'r');
    const head = new Uint8Array(20_000);
    parser.push(head.subarray(0, readSync(fd, head, 0, head.length, 0)));
    expect(await readRestTwoThreads(fd, path, parser, 20_000, Buffer.byteLength(text), { name: 'small.csv' }, { blockBytes: 1 << 20 })).toBe(-1);
    closeSync(fd);
    const long = write('long.csv', `t,v\n0,1\n1,${'1'.repeat(200_000)}\n`);
    const lfd = openSync(long, 'r');
    expect(blockBounds(lfd, 4, 200_015, 1024)).toBeUndefined();
    closeSync(lfd);
  });
});
