import { parseValue } from '../../units/parse.js';
import type { AnalyzeOptions } from '../../signal/analyze-capture.js';

export type Entry = { readonly ok: true; readonly path: string; readonly options: AnalyzeOptions } | { readonly ok: false; readonly message: string };

/**
 * The path line of the attach box: a path, then optionally the same settings
 * `probebook analyze` takes: `--dt 1us`, `--scale 10`, `--channel 2`.
 */
export function parseEntry(text: string): Entry {
  let rest = text.trim();
  const options: { dt?: number; scale?: number; channel?: string } = {};
  const option = /\s+--(dt|scale|channel)(?:\s+|=)(\S+)$/;
  for (let m = option.exec(rest); m; m = option.exec(rest)) {
    const [, name, value = ''] = m;
    if (name === 'channel') options.channel = value;
    else {
      const parsed = parseValue(value, { expected: name === 'dt' ? 's' : 'V', allowTolerance: false });
      if (!parsed.ok || !(parsed.value > 0))
        return { ok: false, message: `--${name} ${value}: give a positive ${name === 'dt' ? 'time, e.g. 1us' : 'voltage, e.g. 10'}` };
      if (name === 'dt') options.dt = parsed.value;
      else options.scale = parsed.value;
    }
    rest = rest.slice(0, m.index);
  }
  if (rest === '') return { ok: false, message: 'type the path of a CSV or WAV capture' };
  return { ok: true, path: rest, options };
}
