import { writeFileSync } from 'node:fs';

/**
 * What the TUI's start is made of, for the benchmark (`bench/ui.bench.ts`): with
 * `PROBEBOOK_START_MARKS=FILE`, the process notes the time of a few named steps
 * and of its first writes to the terminal, and writes them to FILE as JSON when
 * it exits. Times are `performance.now()`, milliseconds since the process began.
 * Without the variable nothing is kept and the terminal's writes are untouched.
 */
const file = process.env.PROBEBOOK_START_MARKS;
const marks: [name: string, at: number][] = [];
const writes: [at: number, bytes: number][] = [];
/** Writes kept: the first frames are what the breakdown is about. */
const writesKept = 40;

/** Note that the start reached `name` now (nothing when not asked for). */
export function startMark(name: string): void {
  if (file) marks.push([name, performance.now()]);
}

if (file) {
  const write = process.stdout.write.bind(process.stdout) as (...args: unknown[]) => boolean;
  process.stdout.write = ((...args: unknown[]) => {
    const chunk = args[0];
    if (writes.length < writesKept)
      writes.push([performance.now(), typeof chunk === 'string' ? Buffer.byteLength(chunk) : ((chunk as Uint8Array)?.length ?? 0)]);
    return write(...args);
  }) as typeof process.stdout.write;
  process.once('exit', () => {
    try {
      const { nodeStart, v8Start, environment, bootstrapComplete } = performance.nodeTiming;
      writeFileSync(file, `${JSON.stringify({ node: { nodeStart, v8Start, environment, bootstrapComplete }, marks, writes })}\n`);
    } catch {
      // A diagnostic for the benchmark: a folder it cannot write to loses only the figures.
    }
  });
}
