import { type Capture, CaptureError, type CaptureReader, type ReadOptions } from './types.js';

/** WAVE_FORMAT_PCM, WAVE_FORMAT_IEEE_FLOAT and WAVE_FORMAT_EXTENSIBLE tags (RIFF/WAVE, 1991). */
const PCM = 1;
const FLOAT = 3;
const EXTENSIBLE = 0xfffe;

function ascii(bytes: Uint8Array, at: number): string {
  return String.fromCharCode(bytes[at] ?? 0, bytes[at + 1] ?? 0, bytes[at + 2] ?? 0, bytes[at + 3] ?? 0);
}

/**
 * The RIFF/WAVE reader: PCM 8, 16, 24 and 32 bit and 32-bit float, any number
 * of channels. Samples are scaled so that full scale is ±`scale` volts
 * (`--scale`, default 1): PCM divides by 2^(bits−1) (8-bit PCM is unsigned,
 * offset 128), float is taken as is.
 */
export const wavReader: CaptureReader = {
  format: 'WAV',
  canRead(name, head) {
    return (ascii(head, 0) === 'RIFF' && ascii(head, 8) === 'WAVE') || /\.wav$/i.test(name);
  },
  read(bytes, options: ReadOptions, onProgress) {
    const name = options.name ?? 'capture';
    if (bytes.length < 12 || ascii(bytes, 0) !== 'RIFF' || ascii(bytes, 8) !== 'WAVE') {
      throw new CaptureError(`${name}: not a RIFF/WAVE file (no "RIFF…WAVE" header)`);
    }
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    let fmt: { tag: number; channels: number; rate: number; bits: number; align: number } | undefined;
    let data: { at: number; length: number; claimed: number } | undefined;
    let at = 12;
    while (at + 8 <= bytes.length) {
      const id = ascii(bytes, at);
      const size = view.getUint32(at + 4, true);
      const body = at + 8;
      if (id === 'fmt ') {
        if (size < 16 || body + 16 > bytes.length) throw new CaptureError(`${name}: the "fmt " chunk is cut short`);
        let tag = view.getUint16(body, true);
        if (tag === EXTENSIBLE && size >= 40) tag = view.getUint16(body + 24, true);
        fmt = {
          tag,
          channels: view.getUint16(body + 2, true),
          rate: view.getUint32(body + 4, true),
          align: view.getUint16(body + 12, true),
          bits: view.getUint16(body + 14, true),
        };
      } else if (id === 'data') {
        // A writer that never patched the size leaves 0 or 0xFFFFFFFF: take the rest of the file.
        const length = size === 0 || size === 0xffffffff || body + size > bytes.length ? bytes.length - body : size;
        data = { at: body, length, claimed: size };
      }
      at = body + size + (size % 2);
      if (data && fmt) break;
    }
    if (!fmt) throw new CaptureError(`${name}: no "fmt " chunk, so the sample format is unknown`);
    if (!data) throw new CaptureError(`${name}: no "data" chunk, so there are no samples`);
    const { tag, channels, rate, bits } = fmt;
    const supported = (tag === PCM && [8, 16, 24, 32].includes(bits)) || (tag === FLOAT && bits === 32);
    if (!supported) {
      throw new CaptureError(
        `${name}: ${tag === FLOAT ? 'float' : tag === PCM ? 'PCM' : `format tag ${tag}`} with ${bits} bits is not supported; use PCM 8/16/24/32-bit or 32-bit float`,
      );
    }
    if (channels < 1 || rate < 1) throw new CaptureError(`${name}: ${channels} channels at ${rate} Hz is not a usable capture`);
    const bytesPer = bits / 8;
    const frame = fmt.align >= bytesPer * channels ? fmt.align : bytesPer * channels;
    const frames = Math.floor(data.length / frame);
    const scale = options.scale ?? 1;
    const out = Array.from({ length: channels }, () => new Float64Array(frames));
    const step = Math.max(1, Math.floor(frames / 20));
    for (let f = 0; f < frames; f++) {
      const base = data.at + f * frame;
      for (let c = 0; c < channels; c++) {
        const p = base + c * bytesPer;
        let v: number;
        if (tag === FLOAT) v = view.getFloat32(p, true);
        else if (bits === 8) v = ((bytes[p] ?? 128) - 128) / 128;
        else if (bits === 16) v = view.getInt16(p, true) / 32768;
        else if (bits === 24) {
          const raw = (bytes[p] ?? 0) | ((bytes[p + 1] ?? 0) << 8) | ((bytes[p + 2] ?? 0) << 16);
          v = ((raw << 8) >> 8) / 8388608;
        } else v = view.getInt32(p, true) / 2147483648;
        (out[c] as Float64Array)[f] = v * scale;
      }
      if (onProgress && f % step === 0) onProgress(f / frames);
    }
    const capture: Capture = {
      channels: out.map((samples, i) => ({ name: `CH${i + 1}`, unit: 'V', samples })),
      sampleRate: rate,
      dt: 1 / rate,
      source: `${name} (WAV, ${tag === FLOAT ? '32-bit float' : `${bits}-bit PCM`}, ${channels} channel${channels === 1 ? '' : 's'})`,
      warnings: [
        ...(data.claimed !== 0 && data.claimed !== 0xffffffff && data.claimed > data.length
          ? [
              `the header claims ${data.claimed} bytes of samples but the file holds ${data.length}: it is cut short; only the ${frames} whole frames there were read`,
            ]
          : []),
        ...(options.scale === undefined ? ['WAV full scale taken as 1 V; give --scale VOLTS for the probe and input range used'] : []),
      ],
    };
    return capture;
  },
};
