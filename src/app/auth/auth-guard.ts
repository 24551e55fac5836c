import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import type { Role } from '../../../shared/roles';
import { AppConfigStore } from '../core/app-config';
import { AuthStore } from './auth-store';

// inject() only works before the first await: every guard takes what it needs up front.

/** Signed-in users only; anyone else goes to sign-in and comes back here afterwards. */
export const authGuard: CanActivateFn = async (_route, state) => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  await auth.ready();
  return auth.signedIn() ? true : router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
};

/** Only the given roles; a signed-in user with another role sees the "not allowed" page. */
export function roleGuard(roles: readonly Role[]): CanActivateFn {
  return async (_route, state) => {
    const auth = inject(AuthStore);
    const router = inject(Router);
    await auth.ready();
    const role = auth.role();
    if (role === null) return router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
    return roles.includes(role) ? true : router.createUrlTree(['/not-allowed'], { queryParams: { page: state.url } });
  };
}

/** The sign-in page is pointless when already signed in. */
export const signedOutGuard: CanActivateFn = async () => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  await auth.ready();
  return auth.signedIn() ? router.createUrlTree(['/studies']) : true;
};

/** The mail outbox exists only while the fake SMTP server runs. */
export const mailFakeGuard: CanActivateFn = async () => {
  const config = inject(AppConfigStore);
  const router = inject(Router);
  await config.ready();
  return config.config().mailFake ? true : router.createUrlTree(['/admin/users']);
};

/** Only same-app paths are followed after sign-in; anything else (another origin, `//host`) lands on studies. */
export function safeReturnUrl(value: string | null | undefined): string {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return '/studies';
  if (value.startsWith('/sign-in')) return '/studies';
  return value;
}
