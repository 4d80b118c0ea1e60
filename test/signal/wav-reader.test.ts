import wavefile from 'wavefile';
import { describe, expect, test } from 'vitest';
import { readCaptureBytes } from '../../src/signal/read-capture.js';
import { CaptureError } from '../../src/signal/types.js';

// Files written and decoded by wavefile (an independent library from the
// registry); our reader must give the same samples, scaled to ±1 at full scale.
const formats = [
  { code: '8', full: 128, offset: 128, max: 127 },
  { code: '16', full: 32768, offset: 0, max: 32767 },
  { code: '24', full: 8388608, offset: 0, max: 8388607 },
  { code: '32', full: 2147483648, offset: 0, max: 2147483647 },
  { code: '32f', full: 1, offset: 0, max: 1 },
] as const;

function tone(n: number, channel: number): number[] {
  return Array.from({ length: n }, (_, i) => 0.9 * Math.sin((2 * Math.PI * (i + 0.3)) / (37.3 + channel * 5)));
}

describe.each(formats)('WAV $code-bit', ({ code, full, offset, max }) => {
  test.each([1, 2])('%i channel(s) read as wavefile decodes them', (channels) => {
    const n = 500;
    const raw = Array.from({ length: channels }, (_, c) => tone(n, c).map((v) => (code === '32f' ? v : Math.round(v * max) + offset)));
    const writer = new wavefile.WaveFile();
    writer.fromScratch(channels, 44100, code, channels === 1 ? (raw[0] ?? []) : raw);
    const bytes = writer.toBuffer();
    const reference = new wavefile.WaveFile(bytes);
    const decoded = reference.getSamples(false, Float64Array) as unknown as Float64Array | Float64Array[];
    const perChannel = channels === 1 ? [decoded as Float64Array] : (decoded as Float64Array[]);
    const capture = readCaptureBytes(bytes, { name: `t${code}.wav`, scale: 10 });
    expect(capture.sampleRate).toBe(44100);
    expect(capture.channels).toHaveLength(channels);
    for (let c = 0; c < channels; c++) {
      const ours = capture.channels[c]?.samples ?? new Float64Array();
      const theirs = perChannel[c] ?? new Float64Array();
      expect(ours.length).toBe(n);
      for (let i = 0; i < n; i++) {
        // wavefile gives raw codes (8-bit unsigned); --scale 10 means full scale is 10 V.
        const expected = (((theirs[i] ?? 0) - offset) / full) * 10;
        // float32 rounding for '32f', exact for PCM.
        expect(Math.abs((ours[i] ?? 0) - expected)).toBeLessThan(1e-6);
      }
    }
  });
});

describe('WAV errors', () => {
  test('a .wav name without a RIFF header says so', () => {
    expect(() => readCaptureBytes(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13]), { name: 'x.wav' })).toThrow(/not a RIFF\/WAVE file/);
  });

  test('an unsupported format names the format', () => {
    const writer = new wavefile.WaveFile();
    writer.fromScratch(1, 8000, '64', [0, 0.5, -0.5, 0]);
    expect(() => readCaptureBytes(writer.toBuffer(), { name: 'x.wav' })).toThrow(CaptureError);
    expect(() => readCaptureBytes(writer.toBuffer(), { name: 'x.wav' })).toThrow(/64 bits is not supported/);
  });

  test('a file cut inside the header is refused, not read as garbage', () => {
    const writer = new wavefile.WaveFile();
    writer.fromScratch(1, 8000, '16', [0, 100, -100, 0]);
    const cut = writer.toBuffer().subarray(0, 30);
    expect(() => readCaptureBytes(cut, { name: 'cut.wav' })).toThrow(CaptureError);
  });
});

describe('a WAV cut short (issue 10, item 16)', () => {
  test('a header claiming more samples than the file holds is read with a warning', () => {
    const writer = new wavefile.WaveFile();
    writer.fromScratch(
      1,
      48000,
      '16',
      tone(1000, 0).map((v) => Math.round(v * 32767)),
    );
    const whole = writer.toBuffer();
    // Cut the file at 600 frames: the data chunk's size still says 1000 frames (2000 bytes).
    const cut = whole.subarray(0, whole.length - 800);
    const capture = readCaptureBytes(cut, { name: 'cut.wav', scale: 1 });
    expect(capture.channels[0]?.samples.length).toBe(600);
    expect(capture.warnings.join(' ')).toMatch(/the header claims 2000 bytes of samples but the file holds 1200: it is cut short/);
    // The whole file reads without it.
    expect(readCaptureBytes(whole, { name: 'whole.wav', scale: 1 }).warnings).toEqual([]);
  });
});
