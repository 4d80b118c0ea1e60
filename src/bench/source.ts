import type { InstrumentsFile } from './instruments-file.js';
import { defaultQueries, queryFor } from './instruments-file.js';
import type { BenchSession, InstrumentCapture, InstrumentReading } from './session.js';

/** How a check is taken: a query answered by a number, or a scope record measured. */
export interface InstrumentPick {
  readonly name: string;
  readonly query: string;
  readonly mode: 'reading' | 'capture';
}

/** What the bring-up screen and `record --from` ask of the bench's instruments. */
export interface InstrumentSource {
  /**
   * The instrument a check will be read with, or null when none covers it. A
   * check a scope record answers (`figure`, its capture figure) is taken from
   * an instrument with a `capture` entry when no query names the check or its unit.
   */
  pick(check: string, unit: string, figure?: string): InstrumentPick | null;
  read(name: string, check: string, unit: string, signal?: AbortSignal): Promise<InstrumentReading>;
  capture(name: string, signal?: AbortSignal): Promise<InstrumentCapture>;
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
  const byCapture = () => file.instruments.find((i) => i.capture !== undefined);
  return {
    pick(check, unit, figure) {
      const inst = byId(check) ?? byUnit(unit);
      const scope = figure ? byCapture() : undefined;
      if (!inst && scope?.capture) return { name: scope.name, query: scope.capture.data, mode: 'capture' };
      const chosen = inst ?? byDefault(unit);
      const spec = chosen ? queryFor(chosen, check, unit) : undefined;
      return chosen && spec ? { name: chosen.name, query: spec.query, mode: 'reading' } : null;
    },
    read: (name, check, unit, signal) => session.readCheck(session.instrument(name), check, unit, signal),
    capture: (name, signal) => session.capture(session.instrument(name), signal),
    close: () => session.close(),
  };
}
