import type { Target } from '../analysis/types.js';
import { instrumentsPath, loadInstruments } from '../bench/instruments-file.js';
import { BenchSession } from '../bench/session.js';
import { captureCsv } from '../bench/capture-csv.js';
import { InstrumentError } from '../bench/errors.js';
import { sessionSource } from '../bench/source.js';
import { measure } from '../signal/measure.js';
import { formatValue } from '../units/format.js';
import type { InstrumentRef } from '../log/types.js';
import type { CommandIo } from './command.js';
import { UsageError } from './errors.js';

/** A value taken from a bench instrument for `record --from`. */
export interface TakenReading {
  readonly value: number;
  readonly raw: string;
  readonly instrument: InstrumentRef;
  /** The scope record the value was measured from (saved with the reading), when it came from one. */
  readonly capture?: { readonly name: string; readonly bytes: Uint8Array };
}

/**
 * Read one check from the named instrument of the bench's instruments file;
 * the connection is closed afterwards. Throws InstrumentsFileError (exit 2)
 * or InstrumentError (exit 1) with one line; nothing is recorded then.
 */
export async function readFromInstrument(name: string, fileFlag: string | undefined, target: Target, io: CommandIo): Promise<TakenReading> {
  const file = await loadInstruments(instrumentsPath(fileFlag, io.env, io.cwd));
  if (!file.instruments.some((i) => i.name === name)) {
    const names = file.instruments.map((i) => i.name);
    throw new UsageError(
      `--from ${JSON.stringify(name)}: no such instrument in ${file.file}; ${names.length ? `it has ${names.join(', ')}` : 'it lists none'}; nothing was saved`,
    );
  }
  const session = new BenchSession(file);
  const source = sessionSource({ ...file, instruments: file.instruments.filter((i) => i.name === name) }, session);
  try {
    const pick = source.pick(target.check, target.unit, target.captureFigure);
    if (pick?.mode === 'capture' && target.captureFigure) {
      // A scope record, measured like an attached capture file (IEEE 181 levels, crossings, harmonics).
      const record = await source.capture(name);
      const figure = target.captureFigure;
      let value: number | null;
      try {
        value = measure(record.samples, record.sampleRate).measurements[figure];
      } catch (error) {
        throw new InstrumentError(name, `record cannot be measured: ${error instanceof Error ? error.message : String(error)}`);
      }
      if (value === null || !Number.isFinite(value))
        throw new InstrumentError(name, `record gives no ${figure} for ${target.check} (check the trigger and the time base)`);
      const captureName = `${name}-${target.check}.csv`;
      return {
        value,
        raw: `${figure} ${formatValue(value, target.unit)} from ${name}'s record`,
        instrument: record.instrument,
        capture: { name: captureName, bytes: captureCsv(record.samples, record.sampleRate) },
      };
    }
    const reading = await session.readCheck(session.instrument(name), target.check, target.unit);
    return { value: reading.value, raw: reading.isOverload ? `OL (${reading.raw})` : reading.raw, instrument: reading.instrument };
  } finally {
    session.close();
  }
}
