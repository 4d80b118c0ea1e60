/** A mistake in the instruments file: names the file, the JSON path and the remedy (exit 2). */
export class InstrumentsFileError extends Error {
  override readonly name = 'InstrumentsFileError';
  constructor(
    readonly file: string,
    readonly path: string,
    readonly detail: string,
  ) {
    super(`instruments ${file}${path ? `, ${path}` : ''}: ${detail}`);
  }
}

/**
 * An instrument that did not give a usable answer: refused, silent, reset,
 * garbage, an SCPI error, a value out of range. One line naming the
 * instrument and what happened (exit 1); nothing is recorded.
 */
export class InstrumentError extends Error {
  override readonly name = 'InstrumentError';
  constructor(
    readonly instrument: string,
    readonly detail: string,
  ) {
    super(`instrument ${instrument}: ${detail}; nothing was recorded`);
  }
}
