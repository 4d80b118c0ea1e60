import { readFile, stat } from 'node:fs/promises';
import { homedir } from 'node:os';
import { isAbsolute, join, resolve } from 'node:path';
import { z } from 'zod';
import { parseValue } from '../units/parse.js';
import { type InstrumentAddress, parseAddress } from './address.js';
import { InstrumentsFileError } from './errors.js';
import type { CaptureFormat } from './scpi.js';

/** A query for one unit or check, with an optional factor (a duty answered in % has scale 0.01). */
export interface QuerySpec {
  readonly query: string;
  readonly scale: number;
}

/** How a scope's record is fetched and scaled (DESIGN §7a's optional `capture`). */
export interface CaptureSpec {
  readonly data: string;
  readonly format: CaptureFormat;
  /** Query for the time between samples (s), or a fixed value. */
  readonly xincrement: string | number;
  /** Query for volts per code, or a fixed value. */
  readonly yscale: string | number;
  /** Query for the offset (codes) subtracted before scaling, or a fixed value. */
  readonly yoffset: string | number;
  readonly bigEndian: boolean;
}

/** One instrument of the bench, validated. */
export interface Instrument {
  readonly name: string;
  readonly address: InstrumentAddress;
  readonly addressText: string;
  /** ms */
  readonly timeout: number;
  /** By unit (`V`, `A`, `Hz`, `Ω`, `1`, …) or by whole check id. */
  readonly queries: Readonly<Record<string, QuerySpec>>;
  readonly capture?: CaptureSpec;
}

export interface InstrumentsFile {
  readonly file: string;
  readonly instruments: readonly Instrument[];
}

/** The SCPI MEASure defaults when an instrument lists no queries (SCPI 1999.0, from memory). */
export const defaultQueries: Readonly<Record<string, QuerySpec>> = {
  V: { query: 'MEAS:VOLT:DC?', scale: 1 },
  A: { query: 'MEAS:CURR:DC?', scale: 1 },
  Ω: { query: 'MEAS:RES?', scale: 1 },
  Hz: { query: 'MEAS:FREQ?', scale: 1 },
};

const defaultTimeoutMs = 3000;
/** A query is sent as one line: printable ASCII only, so nothing odd reaches the instrument. */
const queryPattern = /^[\x20-\x7e]{1,200}$/;
const unitKeys = new Set(['V', 'A', 'Hz', 'ohm', 'Ω', '1', 's', 'F', 'V/V']);

const queryValue = z.union([z.string(), z.strictObject({ query: z.string(), scale: z.optional(z.number()) })], {
  error: 'expected a query such as "MEAS:VOLT:DC?" or {"query": "MEAS:DUTY?", "scale": 0.01}',
});
const fixedOrQuery = z.union([z.string(), z.number()], { error: 'expected a query such as "WAV:XINC?" or a number' });
const schema = z.strictObject({
  instruments: z.array(
    z.strictObject({
      name: z.string({ error: 'expected a name such as "dmm"' }),
      address: z.string({ error: 'expected an address such as "tcp://192.0.2.10:5025"' }),
      timeout: z.optional(z.union([z.string(), z.number()], { error: 'expected a time such as "3 s"' })),
      queries: z.optional(z.record(z.string(), queryValue)),
      capture: z.optional(
        z.strictObject({
          data: z.string({ error: 'expected the record query, e.g. "WAV:DATA?"' }),
          format: z.enum(['ascii', 'int8', 'int16'], { error: 'expected "ascii", "int8" or "int16"' }),
          xincrement: fixedOrQuery,
          yscale: z.optional(fixedOrQuery),
          yoffset: z.optional(fixedOrQuery),
          byteOrder: z.optional(z.enum(['little', 'big'], { error: 'expected "little" or "big"' })),
        }),
      ),
    }),
    { error: 'expected a list of instruments' },
  ),
});

function pathOf(issuePath: readonly PropertyKey[]): string {
  return issuePath.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i === 0 ? '' : '.'}${String(p)}`)).join('');
}

/**
 * Where the instruments file is (DESIGN §7a): `--instruments FILE`, else
 * `PROBEBOOK_INSTRUMENTS`, else `$XDG_CONFIG_HOME/probebook/instruments.json`
 * (a relative XDG_CONFIG_HOME is ignored, as the XDG spec says; default `~/.config`).
 */
export function instrumentsPath(flag: string | undefined, env: NodeJS.ProcessEnv, cwd: string): string {
  if (flag !== undefined && flag !== '') return resolve(cwd, flag);
  if (env.PROBEBOOK_INSTRUMENTS) return resolve(cwd, env.PROBEBOOK_INSTRUMENTS);
  const config = env.XDG_CONFIG_HOME && isAbsolute(env.XDG_CONFIG_HOME) ? env.XDG_CONFIG_HOME : join(homedir(), '.config');
  return join(config, 'probebook', 'instruments.json');
}

/** Validate the parsed JSON of an instruments file. */
export function parseInstruments(json: unknown, file: string): InstrumentsFile {
  const result = schema.safeParse(json);
  if (!result.success) {
    const issue = result.error.issues[0];
    throw new InstrumentsFileError(file, pathOf(issue?.path ?? []), issue?.message ?? 'not an instruments file');
  }
  const seen = new Set<string>();
  const instruments = result.data.instruments.map((raw, i): Instrument => {
    const at = `instruments[${i}]`;
    const name = raw.name.trim();
    if (!/^[A-Za-z0-9_.-]{1,40}$/.test(name))
      throw new InstrumentsFileError(file, `${at}.name`, `${JSON.stringify(raw.name)}: a name is 1–40 letters, digits, "_", "." or "-", e.g. "dmm"`);
    if (seen.has(name)) throw new InstrumentsFileError(file, `${at}.name`, `${JSON.stringify(name)} is named twice; give each instrument its own name`);
    seen.add(name);
    const address = parseAddress(raw.address);
    if ('problem' in address) throw new InstrumentsFileError(file, `${at}.address`, address.problem);
    let timeout = defaultTimeoutMs;
    if (raw.timeout !== undefined) {
      const t = typeof raw.timeout === 'number' ? { ok: true as const, value: raw.timeout } : parseValue(raw.timeout, { expected: 's', allowTolerance: false });
      if (!t.ok || !Number.isFinite(t.value) || t.value <= 0 || t.value > 600)
        throw new InstrumentsFileError(file, `${at}.timeout`, `${JSON.stringify(raw.timeout)}: write a time from 1 ms to 600 s, e.g. "3 s"`);
      timeout = Math.max(1, Math.round(t.value * 1000));
    }
    const queries: Record<string, QuerySpec> = {};
    for (const [key, value] of Object.entries(raw.queries ?? {})) {
      const where = `${at}.queries.${key}`;
      if (!unitKeys.has(key) && !/^[^.\s]+\.[^\s]+$/.test(key))
        throw new InstrumentsFileError(file, where, `${JSON.stringify(key)} is neither a unit (V, A, Hz, ohm, 1) nor a check id such as "osc.freq"`);
      const spec = typeof value === 'string' ? { query: value, scale: 1 } : { query: value.query, scale: value.scale ?? 1 };
      if (!queryPattern.test(spec.query)) throw new InstrumentsFileError(file, where, 'a query is one line of printable text, at most 200 characters');
      if (!Number.isFinite(spec.scale) || spec.scale === 0)
        throw new InstrumentsFileError(file, `${where}.scale`, 'scale must be a non-zero number (0.01 for an answer in %)');
      queries[key === 'ohm' ? 'Ω' : key] = spec;
    }
    let capture: CaptureSpec | undefined;
    if (raw.capture) {
      const c = raw.capture;
      for (const [k, v] of Object.entries({ data: c.data, xincrement: c.xincrement, yscale: c.yscale, yoffset: c.yoffset })) {
        if (typeof v === 'string' && !queryPattern.test(v))
          throw new InstrumentsFileError(file, `${at}.capture.${k}`, 'a query is one line of printable text, at most 200 characters');
        if (typeof v === 'number' && !Number.isFinite(v)) throw new InstrumentsFileError(file, `${at}.capture.${k}`, 'expected a finite number');
      }
      if (typeof c.xincrement === 'number' && c.xincrement <= 0)
        throw new InstrumentsFileError(file, `${at}.capture.xincrement`, 'the time between samples must be above 0 s');
      capture = { data: c.data, format: c.format, xincrement: c.xincrement, yscale: c.yscale ?? 1, yoffset: c.yoffset ?? 0, bigEndian: c.byteOrder === 'big' };
    }
    const hasQueries = Object.keys(queries).length > 0;
    return { name, address, addressText: raw.address.trim(), timeout, queries: hasQueries ? queries : defaultQueries, ...(capture ? { capture } : {}) };
  });
  return { file, instruments };
}

/** Read and validate the instruments file; a missing file is an error naming where it was looked for. */
export async function loadInstruments(path: string): Promise<InstrumentsFile> {
  let text: string;
  try {
    const info = await stat(path);
    if (!info.isFile()) throw new InstrumentsFileError(path, '', 'is not a regular file');
    if (info.size > 1_000_000) throw new InstrumentsFileError(path, '', 'is larger than 1 MB; an instruments file is a short list');
    text = await readFile(path, 'utf8');
  } catch (error) {
    if (error instanceof InstrumentsFileError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT')
      throw new InstrumentsFileError(path, '', 'not found; pass --instruments FILE or set PROBEBOOK_INSTRUMENTS (see probebook instruments --help)');
    throw new InstrumentsFileError(path, '', `cannot be read (${code ?? String(error)})`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new InstrumentsFileError(path, '', `is not valid JSON (${error instanceof Error ? error.message : String(error)})`);
  }
  return parseInstruments(json, path);
}

/** The query for a check: by its whole id first, else by its unit. */
export function queryFor(instrument: Instrument, check: string, unit: string): QuerySpec | undefined {
  return instrument.queries[check] ?? instrument.queries[unit] ?? (unit === 'Ω' ? instrument.queries['ohm'] : undefined);
}
