/** What an answer is read as: one text line, or a record (a block or a line). */
export type AnswerKind = 'line' | 'record';

/**
 * A connection to one instrument. `query` sends one command line and reads its
 * answer within `timeoutMs`; it rejects with a plain message (the caller names
 * the instrument). After any failure the transport is closed and unusable: the
 * session opens a new one, so a late answer is never read as the next one.
 */
export interface Transport {
  query(command: string, kind: AnswerKind, timeoutMs: number, signal?: AbortSignal): Promise<Buffer>;
  /** Send a command that has no answer. */
  send(command: string): Promise<void>;
  close(): void;
  readonly isOpen: boolean;
}

/** Text answers are short; a peer sending more than this without a newline is cut off. */
export const lineCap = 256 * 1024;
/** A scope record of a few million 16-bit points fits. */
export const recordCap = 32 * 1024 * 1024;

export class TransportFailure extends Error {
  override readonly name = 'TransportFailure';
}

/** Human words for a socket or device error code. */
export function errnoWords(error: unknown, where: string): string {
  const code = (error as NodeJS.ErrnoException | undefined)?.code;
  switch (code) {
    case 'ECONNREFUSED':
      return `refused the connection at ${where} (is it on, and is the port right?)`;
    case 'ECONNRESET':
    case 'EPIPE':
      return `reset the connection at ${where}`;
    case 'ETIMEDOUT':
      return `did not answer the connection at ${where} in time`;
    case 'EHOSTUNREACH':
    case 'ENETUNREACH':
      return `cannot be reached at ${where} (network unreachable)`;
    case 'ENOTFOUND':
    case 'EAI_AGAIN':
      return `has a host name that does not resolve (${where})`;
    case 'ENOENT':
      return `has no device at ${where}`;
    case 'EACCES':
    case 'EPERM':
      return `cannot be opened at ${where}: permission denied (join the group that owns the device, e.g. dialout)`;
    case 'EBUSY':
      return `is busy at ${where} (another program holds it)`;
    default:
      return `failed at ${where}: ${error instanceof Error ? error.message.split('\n')[0] : String(error)}`;
  }
}
