import { InstrumentError } from './errors.js';
import type { Instrument, InstrumentsFile } from './instruments-file.js';
import { queryFor } from './instruments-file.js';
import { decodeRecord, parseScpiNumber, shortText } from './scpi.js';
import { openSerial } from './serial-transport.js';
import { openTcp } from './tcp-transport.js';
import { type AnswerKind, type Transport, TransportFailure } from './transport.js';
import { UsbtmcTransport } from './usbtmc-transport.js';

/** A value taken from an instrument for one check. */
export interface InstrumentReading {
  /** SI base units; +∞ for an overload (SCPI 9.9E37). */
  readonly value: number;
  readonly isOverload: boolean;
  /** The instrument's answer as received. */
  readonly raw: string;
  readonly query: string;
  readonly instrument: { readonly name: string; readonly identity: string | null };
}

/** A scope record scaled to volts, with its sample rate. */
export interface InstrumentCapture {
  readonly samples: Float64Array;
  readonly sampleRate: number;
  readonly instrument: { readonly name: string; readonly identity: string | null };
}

const emptyIdentity = 'answered *IDN? with an empty line';

/**
 * Plausible ranges of an answer by the check's unit: a value outside is a
 * wrong query or a wrong function on the meter, not a reading (common
 * practice, no source: the ranges of ordinary bench instruments).
 */
const plausible: Readonly<Record<string, readonly [number, number]>> = {
  V: [-2000, 2000],
  A: [-50, 50],
  Hz: [0, 1e11],
  Ω: [-10, 1e12],
  s: [-1e4, 1e4],
  F: [0, 10],
  'V/V': [-1e7, 1e7],
  '1': [-1e4, 1e4],
};

/**
 * The instruments of one bench for one session: one connection per
 * instrument, opened on first use, reused, and opened again after a failure.
 * Every wait is bounded by the instrument's timeout.
 */
export class BenchSession {
  private readonly open = new Map<string, Transport>();
  private readonly identities = new Map<string, string | null>();

  constructor(readonly file: InstrumentsFile) {}

  /** The instrument of that name, or an error listing the names the file has. */
  instrument(name: string): Instrument {
    const found = this.file.instruments.find((i) => i.name === name);
    if (!found) {
      const names = this.file.instruments.map((i) => i.name);
      throw new InstrumentError(name, `is not in ${this.file.file}; ${names.length ? `its instruments are ${names.join(', ')}` : 'it lists no instrument'}`);
    }
    return found;
  }

  private async transport(inst: Instrument, signal?: AbortSignal): Promise<Transport> {
    const existing = this.open.get(inst.name);
    if (existing?.isOpen) return existing;
    const a = inst.address;
    const t =
      a.kind === 'tcp' ? await openTcp(a, inst.timeout, signal) : a.kind === 'serial' ? await openSerial(a, inst.timeout) : await UsbtmcTransport.open(a);
    this.open.set(inst.name, t);
    return t;
  }

  /** Send one query and read its answer; failures become one InstrumentError line. */
  async ask(inst: Instrument, command: string, kind: AnswerKind = 'line', signal?: AbortSignal): Promise<Buffer> {
    try {
      const t = await this.transport(inst, signal);
      return await t.query(command, kind, inst.timeout, signal);
    } catch (error) {
      this.open.get(inst.name)?.close();
      this.open.delete(inst.name);
      if (error instanceof TransportFailure) throw new InstrumentError(inst.name, error.message);
      throw error;
    }
  }

  /** `*IDN?` (IEEE 488.2 common command), cached for the session. */
  async identity(inst: Instrument, signal?: AbortSignal): Promise<string> {
    const known = this.identities.get(inst.name);
    if (typeof known === 'string') return known;
    const answer = shortText((await this.ask(inst, '*IDN?', 'line', signal)).toString('latin1'), 200);
    if (answer === '') throw new InstrumentError(inst.name, emptyIdentity);
    this.identities.set(inst.name, answer);
    return answer;
  }

  /**
   * Take one reading for a check: its query by check id, else by unit; the
   * answer must be an SCPI number inside the unit's plausible range, or the
   * overflow value (an overload).
   */
  async readCheck(inst: Instrument, check: string, unit: string, signal?: AbortSignal): Promise<InstrumentReading> {
    const spec = queryFor(inst, check, unit);
    if (!spec) {
      const keys = Object.keys(inst.queries);
      throw new InstrumentError(
        inst.name,
        `has no query for ${check} (unit ${unit}); add "${unit === 'Ω' ? 'ohm' : unit}" or "${check}" to its queries (it has ${keys.join(', ') || 'none'})`,
      );
    }
    // Identity first: a wrong port or a dead peer is found before the measurement.
    let identity: string | null = null;
    try {
      identity = await this.identity(inst, signal);
    } catch (error) {
      // An instrument that answers *IDN? with nothing may still measure; a silent or dead one costs one timeout, not two.
      if (!(error instanceof InstrumentError) || error.detail !== emptyIdentity) throw error;
    }
    const answer = (await this.ask(inst, spec.query, 'line', signal)).toString('latin1');
    const parsed = parseScpiNumber(answer);
    const raw = shortText(answer, 80);
    if (parsed.kind === 'error') throw new InstrumentError(inst.name, `${parsed.message} to ${spec.query}`);
    const who = { name: inst.name, identity };
    if (parsed.kind === 'overload') return { value: Infinity, isOverload: true, raw, query: spec.query, instrument: who };
    const value = parsed.value * spec.scale;
    const range = plausible[unit];
    if (range && (value < range[0] || value > range[1])) {
      throw new InstrumentError(
        inst.name,
        `answered ${raw} to ${spec.query}, out of range for a reading in ${unit} (check the query and the instrument's function)`,
      );
    }
    return { value, isOverload: false, raw, query: spec.query, instrument: who };
  }

  private async numberOf(inst: Instrument, source: string | number, what: string, signal?: AbortSignal): Promise<number> {
    if (typeof source === 'number') return source;
    const parsed = parseScpiNumber((await this.ask(inst, source, 'line', signal)).toString('latin1'));
    if (parsed.kind !== 'number')
      throw new InstrumentError(inst.name, `${what} (${source}): ${parsed.kind === 'error' ? parsed.message : 'answered the overflow value'}`);
    return parsed.value;
  }

  /** Fetch a scope record (`capture` in the file) and scale it: volts = (code − yoffset) · yscale. */
  async capture(inst: Instrument, signal?: AbortSignal): Promise<InstrumentCapture> {
    const spec = inst.capture;
    if (!spec) throw new InstrumentError(inst.name, 'has no "capture" entry in the instruments file; add one to take scope records');
    let identity: string | null = null;
    try {
      identity = await this.identity(inst, signal);
    } catch (error) {
      if (!(error instanceof InstrumentError) || error.detail !== emptyIdentity) throw error;
    }
    const dt = await this.numberOf(inst, spec.xincrement, 'time between samples', signal);
    if (!(dt > 0) || !Number.isFinite(dt)) throw new InstrumentError(inst.name, `gave a time between samples of ${dt} s; expected a positive time`);
    const yscale = await this.numberOf(inst, spec.yscale, 'vertical scale', signal);
    const yoffset = await this.numberOf(inst, spec.yoffset, 'vertical offset', signal);
    const data = await this.ask(inst, spec.data, 'record', signal);
    const codes = decodeRecord(data, spec.format, spec.bigEndian);
    if ('problem' in codes) throw new InstrumentError(inst.name, `record (${spec.data}): ${codes.problem}`);
    if (codes.length < 16) throw new InstrumentError(inst.name, `record (${spec.data}) holds ${codes.length} samples; at least 16 are needed`);
    const samples = new Float64Array(codes.length);
    for (let i = 0; i < codes.length; i++) samples[i] = ((codes[i] ?? 0) - yoffset) * yscale;
    return { samples, sampleRate: 1 / dt, instrument: { name: inst.name, identity } };
  }

  /** Close every connection (the process may then exit). */
  close(): void {
    for (const t of this.open.values()) t.close();
    this.open.clear();
  }
}
