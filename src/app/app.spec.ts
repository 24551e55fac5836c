import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/roles';
import { App } from './app';
import { AuthStore } from './auth/auth-store';
import { AppConfigStore } from './core/app-config';

// What each role must see in the shell: foundation issue (issue 2) and the client brief.
describe('App shell navigation', () => {
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [App],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
  });

  async function render(role: Role | null, mailFake: boolean): Promise<HTMLElement> {
    const config = TestBed.inject(AppConfigStore);
    const ready = config.ready();
    backend.expectOne('/api/config').flush({ version: '0.1.0', mailFake, demo: true });
    await ready;
    if (role) TestBed.inject(AuthStore).setUser({ id: 3, email: `${role}@lab.example`, name: 'Rita Role', role, active: true });
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  const navTargets = (el: HTMLElement) => Array.from(el.querySelectorAll('[data-nav]')).map((a) => a.getAttribute('data-nav'));

  it('shows an administrator the admin section, including the outbox while mail is faked', async () => {
    const el = await render('admin', true);
    expect(navTargets(el)).toEqual(['/studies', '/calc/hill48', '/admin/users', '/admin/invitations', '/admin/outbox', '/account', '/tokens', '/api-docs']);
    expect(el.textContent).toContain('Administration');
    expect(el.querySelector('[data-testid=signed-in-role]')?.textContent?.trim()).toBe('Administrator');
  });

  it.each([
    ['engineer', 'Research engineer'],
    ['statistician', 'Statistician'],
    ['supervisor', 'Supervisor'],
  ] as const)('shows %s only studies, the calculator and account, with name and role in the top bar', async (role, label) => {
    const el = await render(role, true);
    expect(navTargets(el)).toEqual(['/studies', '/calc/hill48', '/account', '/tokens', '/api-docs']);
    expect(el.textContent).not.toContain('Administration');
    expect(el.querySelector('[data-testid=signed-in-user]')?.textContent).toContain('Rita Role');
    expect(el.querySelector('[data-testid=signed-in-role]')?.textContent?.trim()).toBe(label);
  });

  it('shows no navigation and no sign-out button when signed out', async () => {
    const el = await render(null, true);
    expect(navTargets(el)).toEqual([]);
    expect(el.querySelector('.sign-out')).toBeNull();
    expect(el.querySelector('.brand-name')?.textContent).toBe('Specimetry');
  });
});
