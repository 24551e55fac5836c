import { HttpClient, HttpContext, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { Observable, catchError, firstValueFrom, map, of, switchMap, tap } from 'rxjs';
import type { LoginBody, PublicUser } from '../../../shared/auth';
import { ROLE_LABELS } from '../../../shared/roles';
import { ApiError, ERRORS_SHOWN_INLINE } from '../core/api-error';

interface UserResponse {
  user: PublicUser;
}

/** Who is signed in. The single source the guards, the shell and the pages read. */
@Injectable({ providedIn: 'root' })
export class AuthStore {
  private readonly http = inject(HttpClient);
  private readonly current = signal<PublicUser | null>(null);
  private loading: Promise<void> | null = null;

  readonly user = this.current.asReadonly();
  readonly signedIn = computed(() => this.current() !== null);
  readonly role = computed(() => this.current()?.role ?? null);
  readonly roleLabel = computed(() => {
    const role = this.role();
    return role ? ROLE_LABELS[role] : '';
  });

  /**
   * Asks the server who we are (once). Besides the answer, this first call makes the server set the
   * XSRF-TOKEN cookie that every later POST/PATCH must echo back.
   */
  ready(): Promise<void> {
    this.loading ??= firstValueFrom(this.http.get<UserResponse>('/api/me')).then(
      (res) => this.current.set(res.user),
      (error: unknown) => {
        // 401 = nobody signed in (the normal case on a fresh visit). Other failures were already shown
        // by the error interceptor; either way the app starts signed out rather than not at all.
        if (!(error instanceof ApiError || error instanceof HttpErrorResponse)) console.error('[Specimetry] /api/me failed', error);
        this.current.set(null);
      },
    );
    return this.loading;
  }

  signIn(body: LoginBody): Observable<PublicUser> {
    return this.http
      .post<UserResponse>('/api/auth/login', body, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) })
      .pipe(
        map((res) => res.user),
        tap((user) => this.current.set(user)),
      );
  }

  /**
   * Signing out destroys the server session and with it the XSRF token the cookie still holds; the
   * follow-up GET /api/me (answering 401) starts a fresh session whose token the next sign-in needs.
   */
  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/logout', null).pipe(
      tap(() => this.current.set(null)),
      switchMap(() =>
        this.http.get<UserResponse>('/api/me').pipe(
          map(() => undefined),
          // Expected: 401, the session is gone. That is the answer we wanted, not a failure.
          catchError(() => of(undefined)),
        ),
      ),
    );
  }

  /** For flows that sign the user in as a side effect (accepting an invitation). */
  setUser(user: PublicUser): void {
    this.current.set(user);
  }

  /** The server said the session is gone (401). */
  clear(): void {
    this.current.set(null);
  }
}
