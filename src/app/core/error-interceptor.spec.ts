import { HttpClient, HttpContext, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { AuthStore } from '../auth/auth-store';
import { ApiError, ERRORS_SHOWN_INLINE } from './api-error';
import { errorInterceptor } from './error-interceptor';
import { Notifier } from './notifier';

@Component({ template: '' })
class Blank {}

describe('errorInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let router: Router;
  const notifier = { error: vi.fn(), info: vi.fn() };

  beforeEach(() => {
    notifier.error.mockReset();
    notifier.info.mockReset();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'sign-in', component: Blank },
          { path: 'admin/users', component: Blank },
        ]),
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
        { provide: Notifier, useValue: notifier },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
  });
  afterEach(() => backend.verify());

  /** Issues a GET, answers it with `status` + `body`, and returns what the caller receives as error. */
  async function failWith(url: string, status: number, body: string | object | null, context?: HttpContext, method: 'GET' | 'POST' = 'GET'): Promise<ApiError> {
    const call = firstValueFrom(method === 'GET' ? http.get(url, { context }) : http.post(url, {}, { context }));
    backend.expectOne(url).flush(body, { status, statusText: 'x' });
    const error: unknown = await call.then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(ApiError);
    return error as ApiError;
  }

  it('sends the user to sign-in with the page they were on as returnUrl on a 401, and signs them out', async () => {
    await router.navigateByUrl('/admin/users?sort=name');
    const auth = TestBed.inject(AuthStore);
    auth.setUser({ id: 1, email: 'a@lab.example', name: 'A', role: 'admin', active: true });

    // API contract (issue 2): every protected route answers 401 when the session is gone.
    const error = await failWith('/api/users', 401, { message: 'Sign in first' });
    await vi.waitFor(() => expect(router.url).toBe('/sign-in?returnUrl=%2Fadmin%2Fusers%3Fsort%3Dname'));
    expect(error.status).toBe(401);
    expect(auth.signedIn()).toBe(false);
    expect(notifier.info).toHaveBeenCalledWith('Sign in first');
  });

  it('does not redirect on the GET /api/me probe or the login call', async () => {
    await router.navigateByUrl('/admin/users');
    await failWith('/api/me', 401, { message: 'Not signed in' });
    await failWith('/api/auth/login', 401, { message: 'E-mail or password is not correct' }, new HttpContext().set(ERRORS_SHOWN_INLINE, true), 'POST');
    expect(router.url).toBe('/admin/users');
    expect(notifier.info).not.toHaveBeenCalled();
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('passes the server message and field details through and shows the message', async () => {
    // API contract (issue 2): error body {message, details?:[{path,message}]}.
    const body = { message: 'Check the highlighted fields', details: [{ path: 'email', message: 'Enter a valid e-mail address' }] };
    const error = await failWith('/api/invitations', 400, body, undefined, 'POST');
    expect(error.status).toBe(400);
    expect(error.message).toBe('Check the highlighted fields');
    expect(error.details).toEqual(body.details);
    expect(error.detailFor('email')).toBe('Enter a valid e-mail address');
    expect(notifier.error).toHaveBeenCalledWith('Check the highlighted fields');
  });

  it('drops malformed detail entries instead of passing them on', async () => {
    const error = await failWith('/api/x', 400, { message: 'Bad', details: [{ path: 'a', message: 'fix a' }, { path: 3 }, 'junk'] });
    expect(error.details).toEqual([{ path: 'a', message: 'fix a' }]);
  });

  it('names the status and the path when the server sent no message (a proxy page, say)', async () => {
    const error = await failWith('/api/users', 502, '<html>Bad gateway</html>');
    expect(error.message).toBe(
      'The server ran into a problem (HTTP 502) at /api/users. Try again; if it keeps happening, tell your administrator.',
    );
    expect(notifier.error).toHaveBeenCalledWith(error.message);
  });

  it('explains an unreachable server (status 0)', async () => {
    const call = firstValueFrom(http.get('/api/config'));
    backend.expectOne('/api/config').error(new ProgressEvent('error'));
    const error = await call.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).status).toBe(0);
    expect((error as ApiError).message).toMatch(/cannot be reached/);
  });

  it('maps a bare 403 and 404 to messages that say what happened', async () => {
    expect((await failWith('/api/users', 403, null)).message).toBe('Your role is not allowed to do this.');
    expect((await failWith('/api/studies/9', 404, null)).message).toBe('Not found: /api/studies/9');
  });

  it('leaves the message to the caller when the request says it shows errors inline', async () => {
    const context = new HttpContext().set(ERRORS_SHOWN_INLINE, true);
    const error = await failWith('/api/auth/password-reset', 429, { message: 'Too many requests, try again in 5 minutes' }, context, 'POST');
    expect(error.message).toBe('Too many requests, try again in 5 minutes');
    expect(notifier.error).not.toHaveBeenCalled();
  });
});
