/**
 * A log file that cannot be read as it stands: it does not parse, has the wrong
 * shape or a newer schema. The message is one line naming the file, the place
 * and the remedy; the file is never overwritten.
 */
export class LogDamageError extends Error {
  override readonly name = 'LogDamageError';
  constructor(
    readonly file: string,
    message: string,
  ) {
    super(message);
  }
}

/** A board file stayed locked by another process for longer than the wait allows. */
export class LogLockError extends Error {
  override readonly name = 'LogLockError';
  constructor(
    readonly file: string,
    message: string,
  ) {
    super(message);
  }
}

/** A caller asked the log for something that is not there (unknown run, bad hash). */
export class LogInputError extends Error {
  override readonly name = 'LogInputError';
}

/** A command that only reads was pointed at a folder that holds no log (a mistyped --log): nothing was created. */
export class LogMissingError extends Error {
  override readonly name = 'LogMissingError';
  constructor(
    readonly dir: string,
    message: string,
  ) {
    super(message);
  }
}

/** The error code of a Node file-system error, or undefined. */
export function errorCode(error: unknown): string | undefined {
  return typeof error === 'object' && error !== null && 'code' in error && typeof error.code === 'string' ? error.code : undefined;
}
