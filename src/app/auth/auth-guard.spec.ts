import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { ActivatedRouteSnapshot, CanActivateFn, Router, RouterStateSnapshot, UrlTree, provideRouter } from '@angular/router';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { PublicUser } from '../../../shared/auth';
import type { Role } from '../../../shared/roles';
import { authGuard, roleGuard, safeReturnUrl } from './auth-guard';
import { AuthStore } from './auth-store';

const user = (role: Role): PublicUser => ({ id: 7, email: `${role}@lab.example`, name: 'Test Person', role, active: true });

describe('auth guards', () => {
  let http: HttpTestingController;
  let router: Router;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
  });
  afterEach(() => http.verify());

  /** Runs a guard for `url`, answering the GET /api/me probe as the server would. */
  async function run(guard: CanActivateFn, url: string, me: PublicUser | null): Promise<boolean | UrlTree> {
    const result = TestBed.runInInjectionContext(() => guard({} as ActivatedRouteSnapshot, { url } as RouterStateSnapshot));
    const probe = http.expectOne('/api/me');
    // API contract (issue 2): GET /api/me → 200 {user} or 401.
    if (me) probe.flush({ user: me });
    else probe.flush({ message: 'Not signed in' }, { status: 401, statusText: 'Unauthorized' });
    return (await result) as boolean | UrlTree;
  }

  it('sends a signed-out visitor to sign-in with the page they wanted as returnUrl', async () => {
    const result = await run(authGuard, '/account?tab=password', null);
    expect(result).toBeInstanceOf(UrlTree);
    expect(router.serializeUrl(result as UrlTree)).toBe('/sign-in?returnUrl=%2Faccount%3Ftab%3Dpassword');
  });

  it('lets a signed-in user through', async () => {
    expect(await run(authGuard, '/studies', user('engineer'))).toBe(true);
    expect(TestBed.inject(AuthStore).role()).toBe('engineer');
  });

  it('refuses an engineer an admin page with the "not allowed" page', async () => {
    const result = await run(roleGuard(['admin']), '/admin/users', user('engineer'));
    expect(router.serializeUrl(result as UrlTree)).toBe('/not-allowed?page=%2Fadmin%2Fusers');
  });

  it('lets an administrator open an admin page', async () => {
    expect(await run(roleGuard(['admin']), '/admin/users', user('admin'))).toBe(true);
  });

  it('sends a signed-out visitor of an admin page to sign-in, not to "not allowed"', async () => {
    const result = await run(roleGuard(['admin']), '/admin/invitations', null);
    expect(router.serializeUrl(result as UrlTree)).toBe('/sign-in?returnUrl=%2Fadmin%2Finvitations');
  });
});

describe('safeReturnUrl', () => {
  it('keeps paths inside the app', () => {
    expect(safeReturnUrl('/admin/users?x=1')).toBe('/admin/users?x=1');
  });

  // Open-redirect forms (OWASP Unvalidated Redirects cheat sheet): absolute and protocol-relative URLs.
  it.each(['https://evil.example/', '//evil.example/x', '/\\evil.example', 'javascript:alert(1)', '', undefined, null])(
    'falls back to studies for %s',
    (value) => {
      expect(safeReturnUrl(value)).toBe('/studies');
    },
  );

  it('does not return to the sign-in page itself', () => {
    expect(safeReturnUrl('/sign-in?returnUrl=%2Fstudies')).toBe('/studies');
  });
});
