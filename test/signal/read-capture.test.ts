import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { afterAll, describe, expect, test } from 'vitest';
import { analyzeCaptureFile } from '../../src/signal/analyze-capture.js';
import { readCaptureFile } from '../../src/signal/read-capture.js';
import { CaptureError } from '../../src/signal/types.js';

const dir = mkdtempSync(join(tmpdir(), 'probebook-read-capture-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// A CSV of several read chunks (256 kB each), so rows cross chunk boundaries.
const rows = 60_000;
const big = join(dir, 'big.csv');
writeFileSync(
  big,
  `Time (s),CH1 (V)\n${Array.from({ length: rows }, (_, i) => `${(i * 1e-6).toExponential(9)},${Math.sin((2 * Math.PI * i) / 997.3).toFixed(6)}`).join('\n')}\n`,
);

describe('readCaptureFile', () => {
  test('reads a file of many chunks, reports rising progress to 1, and can keep the bytes', async () => {
    const seen: number[] = [];
    const r = await readCaptureFile(big, { keepBytes: true }, (f) => seen.push(f));
    expect(r.capture.channels[0]?.samples.length).toBe(rows);
    expect(r.capture.sampleRate).toBe(1e6);
    // Row 12345 as written: sin(2π·12345/997.3) to 6 decimals.
    expect(r.capture.channels[0]?.samples[12345]).toBe(Number(Math.sin((2 * Math.PI * 12345) / 997.3).toFixed(6)));
    expect(seen.length).toBeGreaterThan(3);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1] ?? 0);
    expect(seen.at(-1)).toBe(1);
    expect(Buffer.from(r.bytes ?? new Uint8Array()).equals(readFileSync(big))).toBe(true);
  });

  test('without keepBytes the bytes are not returned', async () => {
    const r = await readCaptureFile(big, {});
    expect(r.bytes).toBeUndefined();
    expect(r.capture.channels[0]?.samples.length).toBe(rows);
  });

  test('a WAV file, and the figures through analyzeCaptureFile', async () => {
    const wav = new wavefile.WaveFile();
    wav.fromScratch(
      1,
      48000,
      '24',
      Array.from({ length: 9600 }, (_, i) => Math.round(0.5 * 8388607 * Math.sin((2 * Math.PI * 1000 * i) / 48000))),
    );
    const path = join(dir, 'tone.wav');
    writeFileSync(path, wav.toBuffer());
    const a = await analyzeCaptureFile(path, { scale: 2 });
    // 1 kHz at half of a 2 V full scale: 1 V peak, RMS 1/√2 (handbook), to 0.1 %.
    expect(Math.abs((a.measurements.frequency ?? 0) - 1000)).toBeLessThan(0.01);
    expect(Math.abs(a.measurements.vrmsAc / Math.SQRT1_2 - 1)).toBeLessThan(1e-3);
    expect(a.measurements.shape).toBe('sine');
  });

  test('missing files, folders and channels are clear errors', async () => {
    await expect(readCaptureFile(join(dir, 'none.csv'))).rejects.toThrow(/none.csv: no such file/);
    mkdirSync(join(dir, 'folder'));
    await expect(readCaptureFile(join(dir, 'folder'))).rejects.toThrow(/is a folder/);
    await expect(analyzeCaptureFile(big, { channel: 'CH9' })).rejects.toThrow(CaptureError);
    await expect(analyzeCaptureFile(big, { channel: '2' })).rejects.toThrow(/channel 2 does not exist; the capture has 1 \(CH1\)/);
  });
});

describe('files that are not captures (issue 10, item 12)', () => {
  test('a FIFO or a device is refused at once, never read forever', async () => {
    const fifo = join(dir, 'scope-fifo.csv');
    execFileSync('mkfifo', [fifo]);
    await expect(readCaptureFile(fifo)).rejects.toThrow(/not a regular file/);
    await expect(readCaptureFile('/dev/zero')).rejects.toThrow(/not a regular file/);
  });
});
