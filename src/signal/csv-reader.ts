import { CsvParser } from './csv-parser.js';
import type { CaptureReader } from './types.js';

/** Bytes handed to the parser at a time, so progress can be reported. */
const chunk = 4 * 1024 * 1024;

/** CSV as instruments and tools export it (see `csv-dialect.ts` for what is accepted). */
export const csvReader: CaptureReader = {
  format: 'CSV',
  canRead(name, head) {
    if (/\.(csv|txt|tsv|dat)$/i.test(name)) return true;
    // Text without NUL bytes is worth a try.
    return head.length > 0 && !head.includes(0);
  },
  read(bytes, options, onProgress) {
    const parser = new CsvParser(options, bytes.length);
    for (let at = 0; at < bytes.length; at += chunk) {
      parser.push(bytes.subarray(at, Math.min(bytes.length, at + chunk)));
      onProgress?.(Math.min(1, (at + chunk) / bytes.length));
    }
    return parser.end();
  },
};
