/**
 * The one error type the response calculator throws for bad input. Routes map it to HTTP 400.
 * Its message names the offending value and says what would be physically admissible, so the
 * user can correct the input without reading the theory.
 */
export class CalcInputError extends Error {
  override readonly name = 'CalcInputError';
  constructor(
    message: string,
    /** The offending value or field, when there is one, so callers can point at it. */
    readonly detail?: unknown,
  ) {
    super(message);
  }
}
