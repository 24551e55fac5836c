/** The one error type routes and services throw for an expected failure with an HTTP status. */
export class HttpError extends Error {
  override readonly name = 'HttpError';
  constructor(
    readonly status: number,
    message: string,
    readonly extra?: { details?: { path: string; message: string }[]; current?: unknown; retryAfterSeconds?: number },
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new HttpError(404, `${what} was not found`);
export const forbidden = (why = 'You are not allowed to do this') => new HttpError(403, why);
export const conflict = (message: string, current?: unknown) => new HttpError(409, message, { current });
