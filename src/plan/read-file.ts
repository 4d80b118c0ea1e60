import { constants } from 'node:fs';
import { type FileHandle, open } from 'node:fs/promises';
import { resolve } from 'node:path';
import { PlanError } from './errors.js';

/**
 * Plan size limits: far above any real board (the demo plans have 5 stages and
 * 4 branches). Loading and chain building are linear in the stages (200 stages:
 * a few milliseconds each). `targets` is not: the worst-case search evaluates
 * the chain stages × parts times, and where every stage loads the one before,
 * every part reaches every stage and one evaluation grows faster than the stages
 * (each corner search asks the load down the rest of the chain). Measured on a
 * ladder of loaded RC low-passes (bench/plan-size.bench.ts, 200 trials, on a
 * shared 2-core machine): 10 stages 0.23 s, 20 stages 1.4 s, 40 stages 20 s,
 * 6–14× per doubling, so a fully loaded chain of 200 stages would take hours. A
 * chain whose stages are buffered (an op-amp output feels no load) stays far
 * cheaper: its parts reach only their own stage and those after it.
 */
export const maxPlanBytes = 1_000_000;
export const maxStages = 200;

/**
 * A plan file's text, without checking it (`loadPlanFile` does): its own module, so
 * the bench screen can refuse a missing or unreadable --plan before its first frame
 * without loading the plan schema and the stage models. Throws `PlanError` naming
 * the file as given; `cwd` resolves a relative path.
 */
export async function readPlanFile(file: string, options: { readonly cwd?: string } = {}): Promise<string> {
  let handle: FileHandle | undefined;
  try {
    // Opened without blocking: a FIFO or a device would otherwise hang the open (or the read) forever.
    handle = await open(options.cwd === undefined ? file : resolve(options.cwd, file), constants.O_RDONLY | constants.O_NONBLOCK);
    const info = await handle.stat();
    if (info.isDirectory()) throw new PlanError(file, '', 'is a folder; give the path of a *.plan.json file');
    if (!info.isFile()) throw new PlanError(file, '', 'is not a regular file (a pipe, a device or a socket); give the path of a *.plan.json file');
    if (info.size > maxPlanBytes)
      throw new PlanError(
        file,
        '',
        `is ${(info.size / 1e6).toFixed(1)} MB; a plan is at most ${maxPlanBytes / 1e6} MB (${maxStages} stages), so this is not one`,
      );
    return await handle.readFile('utf8');
  } catch (error) {
    if (error instanceof PlanError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new PlanError(file, '', 'no such file; give the path of a *.plan.json file');
    if (code === 'EISDIR') throw new PlanError(file, '', 'is a folder; give the path of a *.plan.json file');
    if (code === 'EACCES' || code === 'EPERM') throw new PlanError(file, '', "cannot be read: permission denied; check the file's permissions");
    throw new PlanError(file, '', `cannot be read (${code ?? (error as Error).message})`);
  } finally {
    await handle?.close();
  }
}
