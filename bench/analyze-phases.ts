// Run by bench/analyze.bench.ts in a fresh process per round (one-shot, as the
// command runs): how long reading + parsing and measuring take in process, and
// with one or two threads for the read. Prints one JSON line. Not a test.
import { measure } from '../src/signal/measure.js';
import { readCaptureFile } from '../src/signal/read-capture.js';

const [file, threads] = process.argv.slice(2);
if (!file) throw new Error('usage: analyze-phases.ts FILE [1|2]');
const t0 = performance.now();
const read = await readCaptureFile(
  file,
  threads === '1' ? { twoThread: { fromBytes: Number.POSITIVE_INFINITY } } : threads === '2' ? { twoThread: { fromBytes: 0 } } : {},
);
const t1 = performance.now();
const samples = read.capture.channels[0]?.samples ?? new Float64Array(0);
const m = measure(samples, read.capture.sampleRate);
const t2 = performance.now();
const text = JSON.stringify(m.measurements);
const t3 = performance.now();
console.log(JSON.stringify({ readMs: t1 - t0, measureMs: t2 - t1, outputMs: t3 - t2, startMs: t0, frequency: m.measurements.frequency, bytes: text.length }));
