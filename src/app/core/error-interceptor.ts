import { HttpErrorResponse, HttpInterceptorFn, HttpRequest } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { AuthStore } from '../auth/auth-store';
import { ERRORS_SHOWN_INLINE, toApiError } from './api-error';
import { Notifier } from './notifier';

/** A 401 from these is an answer, not a lost session: "nobody is signed in" and "wrong password". */
const AUTH_PROBES: readonly { method: string; path: string }[] = [
  { method: 'GET', path: '/api/me' },
  { method: 'POST', path: '/api/auth/login' },
];

function isAuthProbe(req: HttpRequest<unknown>): boolean {
  const path = new URL(req.url, 'http://local').pathname;
  return AUTH_PROBES.some((p) => p.method === req.method && p.path === path);
}

/**
 * Turns every failed call into an ApiError {status, message, details}, shows it (snack bar unless the
 * caller shows it inline), and sends the user to sign-in on a lost session, remembering where they were.
 */
export const errorInterceptor: HttpInterceptorFn = (req, next) => {
  const router = inject(Router);
  const auth = inject(AuthStore);
  const notifier = inject(Notifier);

  return next(req).pipe(
    catchError((response: unknown) => {
      if (!(response instanceof HttpErrorResponse)) return throwError(() => response);
      const error = toApiError(response);

      if (error.status === 401 && isAuthProbe(req)) {
        // GET /api/me answering 401 just means "signed out"; the sign-in form shows its own 401 inline.
        return throwError(() => error);
      }
      if (error.status === 401) {
        auth.clear();
        // During a navigation the router has not committed the target yet; return there, not to the old page.
        const target = router.currentNavigation()?.finalUrl?.toString() ?? router.url;
        const returnUrl = target.startsWith('/sign-in') ? undefined : target;
        notifier.info(error.message);
        void router.navigate(['/sign-in'], { queryParams: { returnUrl } });
        return throwError(() => error);
      }
      if (!req.context.get(ERRORS_SHOWN_INLINE)) notifier.error(error.message);
      return throwError(() => error);
    }),
  );
};
