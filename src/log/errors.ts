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

/** What an I/O error code means at a bench, and what to do about it. */
const ioReasons: Readonly<Record<string, readonly [reason: string, remedy: string]>> = {
  EACCES: ['permission denied', 'pass --log DIR of a folder you may write to, or ask for write access'],
  EPERM: ['not permitted', 'pass --log DIR of a folder you may write to, or ask for write access'],
  EROFS: ['the file system is read-only', 'pass --log DIR on a writable disk'],
  ENOSPC: ['the disk is full', 'free some space and try again'],
  EDQUOT: ['the disk quota is used up', 'free some space and try again'],
  ENOTDIR: ['a file stands where a folder should be', 'move that file aside or pass another --log DIR'],
  EISDIR: ['a folder stands where a file should be', 'move that folder aside'],
  EIO: ['the disk reported an input/output error', 'check the disk and its cable, then try again'],
  EMFILE: ['too many files are open', 'close other programs and try again'],
  ENFILE: ['too many files are open on this machine', 'close other programs and try again'],
  ENAMETOOLONG: ['the path is too long', 'pass a shorter --log DIR'],
  ELOOP: ['the path loops through symbolic links', 'pass another --log DIR'],
};

/** A file-system failure of the log, as one line with the remedy (the raw code in parentheses). */
export class LogIoError extends Error {
  override readonly name = 'LogIoError';
  constructor(
    message: string,
    readonly code: string,
  ) {
    super(message);
  }
}

/**
 * `error` as a `LogIoError` saying what could not be done, why in bench words,
 * and the remedy (`doing` names the step: "cannot save board A-1 in /x"), or
 * `error` itself when its code is not a known file-system failure.
 */
export function ioFailure(error: unknown, doing: string, path?: string): unknown {
  const code = errorCode(error);
  const known = code === undefined ? undefined : ioReasons[code];
  if (!known || error instanceof LogIoError) return error;
  const [reason, remedy] = known;
  const at = path === undefined ? '' : ` at ${path}`;
  return new LogIoError(
    `${doing}: ${reason}${at} (${code}); ${remedy}${code === 'ENOSPC' || code === 'EDQUOT' || code === 'EROFS' ? '. Nothing was saved' : ''}`,
    code as string,
  );
}
