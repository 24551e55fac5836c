/** The body of every error response from the API. */
export interface ApiErrorBody {
  message: string;
  /** Field-level problems, e.g. from request validation: path in the body and what to fix. */
  details?: { path: string; message: string }[];
  /** Extra machine-readable data, e.g. the current value on a 409 conflict. */
  current?: unknown;
}
