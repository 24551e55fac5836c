/**
 * The one error type the statistics engine throws for bad input. Routes map it to HTTP 400;
 * the command line prints its message and exits with code 2.
 */
export class StatsInputError extends Error {
  override readonly name = 'StatsInputError';
  constructor(
    message: string,
    /** The offending value or field, when there is one, so callers can point at it. */
    readonly detail?: unknown,
  ) {
    super(message);
  }
}
