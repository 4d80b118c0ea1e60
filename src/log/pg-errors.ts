import { maskInText } from './location.js';

/**
 * A PostgreSQL log that cannot do what was asked: server down, wrong
 * password, database missing, connection lost mid-write, a newer schema. One
 * line naming the log (its password masked) and what to do; exit 1.
 */
export class LogServerError extends Error {
  override readonly name = 'LogServerError';
}

type PgLike = { code?: string; message?: string; routine?: string };

/** One line for a driver or server error; `isCommitting` when the commit itself may have gone through. */
export function serverError(error: unknown, shown: string, isCommitting = false): LogServerError {
  if (error instanceof LogServerError) return error;
  const e = (typeof error === 'object' && error !== null ? error : {}) as PgLike;
  const text = maskInText(e.message ?? String(error));
  const at = `log ${shown}`;
  const lost =
    /Connection terminated|connection terminated|ECONNRESET|EPIPE|server closed the connection|terminating connection/i.test(text) ||
    ['57P01', '57P02', '57P03', 'ECONNRESET', 'EPIPE'].includes(e.code ?? '');
  if (lost) {
    return new LogServerError(
      isCommitting
        ? `${at}: the connection was lost while the write was being committed; it may or may not be saved: check with probebook history before recording it again`
        : `${at}: the connection to the server was lost; nothing of this write was saved (the transaction was rolled back); run the command again`,
    );
  }
  switch (e.code) {
    case 'ECONNREFUSED':
      return new LogServerError(`${at}: the server refused the connection (is PostgreSQL running and listening there?)`);
    case 'ENOTFOUND':
    case 'EAI_AGAIN':
      return new LogServerError(`${at}: the host name does not resolve`);
    case 'ETIMEDOUT':
    case 'EHOSTUNREACH':
    case 'ENETUNREACH':
      return new LogServerError(`${at}: the server cannot be reached`);
    case '28P01':
      return new LogServerError(`${at}: password authentication failed; check the user and password in the URL`);
    case '28000':
      return new LogServerError(`${at}: the server does not accept this user from here (pg_hba.conf)`);
    case '3D000':
      return new LogServerError(`${at}: the database does not exist; create it (createdb NAME) or fix the URL`);
    case '42501':
      return new LogServerError(
        `${at}: permission denied (${text.split('\n')[0]}); the user needs CREATE on the database the first time, then SELECT/INSERT/UPDATE on probebook's tables`,
      );
    default:
      break;
  }
  if (/timeout/i.test(text)) return new LogServerError(`${at}: the server did not answer in time (${text.split('\n')[0]})`);
  return new LogServerError(`${at}: ${text.split('\n')[0]}`);
}
