import { resolveLogDir } from './log-dir.js';
import { parseArgs } from './args.js';
import type { Command } from './command.js';
import { UsageError } from './errors.js';
import { analyzeCaptureFile } from '../signal/analyze-capture.js';
import { type ExpectedShape, expectedShapes, shapeMismatch, summaryLines } from '../signal/summary.js';
import { CaptureError } from '../signal/types.js';
import { parseValue, quoteTyped } from '../units/parse.js';
import { resolve } from 'node:path';

const usage = 'probebook analyze CAPTURE [--json] [--expect sine|square|triangle] [--channel N|NAME] [--dt SECONDS] [--scale VOLTS] [--log DIR]';

function positive(value: string | boolean | undefined, name: string, unit: 's' | 'V', example: string): number | undefined {
  if (value === undefined) return undefined;
  const parsed = typeof value === 'string' ? parseValue(value, { expected: unit, allowTolerance: false }) : undefined;
  if (!parsed?.ok || !(parsed.value > 0) || !Number.isFinite(parsed.value)) {
    throw new UsageError(
      `--${name} takes a positive ${unit === 's' ? 'time' : 'voltage'}, e.g. ${example}; got ${typeof value === 'string' ? quoteTyped(value) : String(value)}`,
    );
  }
  return parsed.value;
}

/** `probebook analyze`: measure a capture file and print the figures (DESIGN §7). */
export const analyzeCommand: Command = async (argv, io) => {
  const { options, positionals } = parseArgs(argv, {
    options: { json: 'boolean', expect: 'string', channel: 'string', dt: 'string', scale: 'string', log: 'string', help: 'boolean' },
    positionals: [0, 1],
    usage,
    // A negative number here is a value (refused below as not positive, with the reason), not a flag.
    negativeNumbers: ['dt', 'scale'],
  });
  if (options.help) {
    io.stdout(
      [
        `usage: ${usage}`,
        '  --json     the figures as JSON, SI units, fractions for duty and THD',
        '  --expect   warn (and add "mismatch") when the capture is not that shape, or is clipped or notched',
        '  --channel  channel number (from 1) or header name; default the first',
        '  --dt       sample interval for files without a time column (e.g. 1us)',
        '  --scale    volts at WAV full scale (default 1)',
        'duty, rise, fall and overshoot are given for a square only (null otherwise);',
        'mean and RMS are over whole periods; THD is harmonics 2–50 (below half the sample rate) over the fundamental.',
        '',
      ].join('\n'),
    );
    return 0;
  }
  const file = positionals[0];
  // Accepted like on every command (an empty one refused); a capture analysis never touches the log.
  resolveLogDir(options.log, io.env);
  if (file === undefined) throw new UsageError(`missing argument; usage: ${usage}`);
  const expect = options.expect;
  if (expect !== undefined && !expectedShapes.includes(expect as ExpectedShape)) {
    throw new UsageError(`--expect takes ${expectedShapes.join(', ')}; got ${typeof expect === 'string' ? quoteTyped(expect) : String(expect)}`);
  }
  const dt = positive(options.dt, 'dt', 's', '1us');
  const scale = positive(options.scale, 'scale', 'V', '10');
  const channel = typeof options.channel === 'string' ? options.channel : undefined;
  let analyzed;
  try {
    analyzed = await analyzeCaptureFile(resolve(io.cwd, file), {
      name: file,
      ...(dt !== undefined ? { dt } : {}),
      ...(scale !== undefined ? { scale } : {}),
      ...(channel !== undefined ? { channel } : {}),
    });
  } catch (error) {
    if (error instanceof CaptureError) throw new UsageError(error.message);
    throw error;
  }
  const m = analyzed.measurements;
  const mismatch = expect ? shapeMismatch(m, expect as ExpectedShape) : null;
  if (mismatch) io.stderr(`probebook: warning: ${mismatch.message}\n`);
  if (options.json) {
    const out = {
      samples: m.samples,
      sampleRate: m.sampleRate,
      frequency: m.frequency,
      vpp: m.vpp,
      vrms: m.vrms,
      vrmsAc: m.vrmsAc,
      mean: m.mean,
      duty: m.duty,
      rise: m.rise,
      fall: m.fall,
      thd: m.thd,
      shape: m.shape,
      overshoot: m.overshoot,
      clipped: m.clipped,
      notch: m.notch,
      notchTime: m.notchTime,
      min: m.min,
      max: m.max,
      crestFactor: m.crestFactor,
      formFactor: m.formFactor,
      periods: m.periods,
      window: m.window,
      channel: analyzed.channel.name,
      source: analyzed.capture.source,
      ...(expect ? { expect, mismatch: mismatch ? mismatch.message : null } : {}),
      warnings: m.warnings,
    };
    io.stdout(`${JSON.stringify(out, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))}\n`);
    return 0;
  }
  // The trace is drawn for the text output only: `--json` never loads the chart modules.
  const [{ capturedWindow }, { traceChart }] = await Promise.all([import('../ui/capture/view.js'), import('../ui/charts/trace.js')]);
  const lines = [`${analyzed.capture.source}, channel ${analyzed.channel.name}`, ...summaryLines(m)];
  for (const w of m.warnings) lines.push(`note: ${w}`);
  lines.push('', traceChart(null, capturedWindow(analyzed.channel.samples, m.sampleRate, m.frequency, 3), { width: 72, height: 10 }));
  io.stdout(`${lines.join('\n')}\n`);
  return 0;
};
