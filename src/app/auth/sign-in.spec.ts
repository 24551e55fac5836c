import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { errorInterceptor } from '../core/error-interceptor';
import { Notifier } from '../core/notifier';
import { SignIn } from './sign-in';

@Component({ template: '' })
class Blank {}

describe('SignIn', () => {
  let fixture: ComponentFixture<SignIn>;
  let backend: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [
        provideRouter([{ path: '**', component: Blank }]),
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
        { provide: Notifier, useValue: { error: vi.fn(), info: vi.fn() } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SignIn);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });
  afterEach(() => backend.verify());

  const input = (name: string) => el.querySelector<HTMLInputElement>(`input[name=${name}]`)!;
  const errors = () => Array.from(el.querySelectorAll('mat-error')).map((e) => e.textContent?.trim());

  async function type(name: string, value: string): Promise<void> {
    input(name).value = value;
    input(name).dispatchEvent(new Event('input'));
    input(name).dispatchEvent(new Event('blur'));
    await fixture.whenStable();
  }

  async function submit(): Promise<void> {
    el.querySelector<HTMLButtonElement>('button[type=submit]')!.click();
    await fixture.whenStable();
  }

  it('says what is missing when submitted empty, and sends nothing', async () => {
    await submit();
    expect(errors()).toEqual(['Enter the e-mail address of your Specimetry account', 'Enter your password']);
    backend.expectNone('/api/auth/login');
  });

  it('asks for a complete e-mail address', async () => {
    await type('email', 'engineer-at-lab');
    await type('password', 'x');
    await submit();
    expect(errors()).toEqual(['Enter a complete e-mail address, like name@lab.example']);
    backend.expectNone('/api/auth/login');
  });

  it('signs in and returns to the page the user came from', async () => {
    fixture.componentRef.setInput('returnUrl', '/admin/invitations');
    await type('email', ' admin@specimetry.test ');
    await type('password', 'specimetry-demo');
    await submit();
    const req = backend.expectOne('/api/auth/login');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'admin@specimetry.test', password: 'specimetry-demo' });
    req.flush({ user: { id: 1, email: 'admin@specimetry.test', name: 'Ada Admin', role: 'admin', active: true } });
    const router = TestBed.inject(Router);
    await vi.waitFor(() => expect(router.url).toBe('/admin/invitations'));
  });

  it('shows the server reason inline for wrong credentials and for rate limiting', async () => {
    await type('email', 'engineer@specimetry.test');
    await type('password', 'wrong');
    await submit();
    // API contract (issue 2): 401 {message: "E-mail or password is not correct"}.
    backend.expectOne('/api/auth/login').flush({ message: 'E-mail or password is not correct' }, { status: 401, statusText: 'Unauthorized' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid=form-error]')?.textContent?.trim()).toContain('E-mail or password is not correct');

    await submit();
    backend
      .expectOne('/api/auth/login')
      .flush({ message: 'Too many sign-in attempts; try again in 15 minutes' }, { status: 429, statusText: 'Too Many Requests' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid=form-error]')?.textContent).toContain('try again in 15 minutes');
    expect(TestBed.inject(Notifier).error).not.toHaveBeenCalled();
  });
});
