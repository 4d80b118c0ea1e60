import type { Target } from '../analysis/types.js';
import { instrumentsPath, loadInstruments } from '../bench/instruments-file.js';
import { BenchSession } from '../bench/session.js';
import type { InstrumentRef } from '../log/types.js';
import type { CommandIo } from './command.js';
import { UsageError } from './errors.js';

/** A value taken from a bench instrument for `record --from`. */
export interface TakenReading {
  readonly value: number;
  readonly raw: string;
  readonly instrument: InstrumentRef;
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
    throw new UsageError(`--from ${JSON.stringify(name)}: no such instrument in ${file.file}; ${names.length ? `it has ${names.join(', ')}` : 'it lists none'}; nothing was saved`);
  }
  const session = new BenchSession(file);
  try {
    const reading = await session.readCheck(session.instrument(name), target.check, target.unit);
    return { value: reading.value, raw: reading.isOverload ? `OL (${reading.raw})` : reading.raw, instrument: reading.instrument };
  } finally {
    session.close();
  }
}
