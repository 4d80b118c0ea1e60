/** A bad argument or bad input: exit status 2, one line on stderr (DESIGN §7). */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}
