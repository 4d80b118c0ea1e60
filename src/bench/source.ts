import type { InstrumentsFile } from './instruments-file.js';
import { defaultQueries, queryFor } from './instruments-file.js';
import type { BenchSession, InstrumentReading } from './session.js';

/** What the bring-up screen asks of the bench's instruments. */
export interface InstrumentSource {
  /** The instrument and query a check will be read with, or null when none covers it. */
  pick(check: string, unit: string): { readonly name: string; readonly query: string } | null;
  read(name: string, check: string, unit: string, signal?: AbortSignal): Promise<InstrumentReading>;
  close(): void;
}

/**
 * The instruments of a session as a source: a check is read by the first
 * instrument whose queries name its id, else the first that names its unit,
 * else the first that falls back on the SCPI MEASure defaults.
 */
export function sessionSource(file: InstrumentsFile, session: BenchSession): InstrumentSource {
  const byId = (check: string) => file.instruments.find((i) => i.queries !== defaultQueries && i.queries[check] !== undefined);
  const byUnit = (unit: string) => file.instruments.find((i) => i.queries !== defaultQueries && queryFor(i, '', unit) !== undefined);
  const byDefault = (unit: string) => file.instruments.find((i) => i.queries === defaultQueries && !i.capture && queryFor(i, '', unit) !== undefined);
  return {
    pick(check, unit) {
      const inst = byId(check) ?? byUnit(unit) ?? byDefault(unit);
      const spec = inst ? queryFor(inst, check, unit) : undefined;
      return inst && spec ? { name: inst.name, query: spec.query } : null;
    },
    read: (name, check, unit, signal) => session.readCheck(session.instrument(name), check, unit, signal),
    close: () => session.close(),
  };
}
