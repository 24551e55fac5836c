import { HttpContextToken, HttpErrorResponse } from '@angular/common/http';
import type { ApiErrorBody } from '../../../shared/errors';

/** One field-level problem reported by the server, e.g. `{path: 'email', message: 'Enter a valid e-mail address'}`. */
export interface ApiErrorDetail {
  path: string;
  message: string;
}

/**
 * Every failed HTTP call reaches callers as this one shape, whatever the server, the proxy or the
 * network did, so pages can show `message` and map `details` onto form fields without guessing.
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly details: readonly ApiErrorDetail[] = [],
    /** What the server holds now, when it sent it (a 409 on a stale run edit carries the run). */
    readonly current?: unknown,
  ) {
    super(message);
    this.name = 'ApiError';
  }

  /** The server's message for one body field, if it reported one. */
  detailFor(path: string): string | null {
    return this.details.find((d) => d.path === path)?.message ?? null;
  }
}

/**
 * Set on a request whose caller shows the failure inline (a form's error note) so the interceptor
 * does not also raise a snack bar. The caller then MUST display `ApiError.message` itself.
 */
export const ERRORS_SHOWN_INLINE = new HttpContextToken<boolean>(() => false);

function isErrorBody(body: unknown): body is ApiErrorBody {
  return typeof body === 'object' && body !== null && typeof (body as { message?: unknown }).message === 'string';
}

function readDetails(body: ApiErrorBody): ApiErrorDetail[] {
  if (!Array.isArray(body.details)) return [];
  return body.details.filter(
    (d): d is ApiErrorDetail => typeof d?.path === 'string' && typeof d?.message === 'string',
  );
}

/** What to tell the user when the server sent no message of its own. */
function fallbackMessage(status: number, url: string | null): string {
  const where = url ? new URL(url, 'http://local').pathname : 'the server';
  if (status === 0) return 'The Specimetry server cannot be reached. Check that it is running and your network, then try again.';
  if (status === 401) return 'Your session has ended. Sign in to continue.';
  if (status === 403) return 'Your role is not allowed to do this.';
  if (status === 404) return `Not found: ${where}`;
  if (status === 429) return 'Too many requests. Wait a minute, then try again.';
  if (status >= 500) return `The server ran into a problem (HTTP ${status}) at ${where}. Try again; if it keeps happening, tell your administrator.`;
  return `The request to ${where} failed (HTTP ${status}).`;
}

/** Maps Angular's HttpErrorResponse (any status, any body) onto the app's ApiError. */
export function toApiError(response: HttpErrorResponse): ApiError {
  const body: unknown = response.error;
  if (response.status !== 0 && isErrorBody(body) && body.message.trim() !== '') {
    return new ApiError(response.status, body.message, readDetails(body), body.current);
  }
  return new ApiError(response.status, fallbackMessage(response.status, response.url));
}
