import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, DEMO_PASSWORD, launchBrowser, navTargets, screenshot, signIn, signOut } from './browser';

// Expected navigation per role: issue 2 (foundation) — studies and account for every role, the admin
// pages (users, invitations, and the mail outbox while the built-in fake SMTP runs) for admin only;
// the Hill calculator (issue 7) and API tokens / reference (issue 6) for every signed-in role.
const EXPECTED: Record<string, { label: string; nav: string[] }> = {
  admin: { label: 'Administrator', nav: ['/studies', '/calc/hill48', '/admin/users', '/admin/invitations', '/admin/outbox', '/account', '/tokens', '/api-docs'] },
  engineer: { label: 'Research engineer', nav: ['/studies', '/calc/hill48', '/account', '/tokens', '/api-docs'] },
  statistician: { label: 'Statistician', nav: ['/studies', '/calc/hill48', '/account', '/tokens', '/api-docs'] },
  supervisor: { label: 'Supervisor', nav: ['/studies', '/calc/hill48', '/account', '/tokens', '/api-docs'] },
};

describe('signing in as each demo role', () => {
  let browser: Browser;

  beforeAll(async () => {
    browser = await launchBrowser(inject('baseUrl'));
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('shows the sign-in page with the demo accounts to a visitor', async () => {
    const { page } = browser;
    await page.goto('/');
    await page.waitForURL(/\/sign-in/);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(await page.locator('[data-demo]').count()).toBe(4);
    await screenshot(page, 'sign-in');
  });

  for (const [role, expected] of Object.entries(EXPECTED)) {
    it(`${role}: sees the navigation for the role, the name and the role in the top bar`, async () => {
      const { page } = browser;
      await page.goto('/sign-in');
      await signIn(page, `${role}@specimetry.test`, DEMO_PASSWORD);
      expect(new URL(page.url()).pathname).toBe('/studies');
      expect(await navTargets(page)).toEqual(expected.nav);
      expect((await page.getByTestId('signed-in-role').textContent())?.trim()).toBe(expected.label);
      await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
      await screenshot(page, `studies-${role}`);
      await signOut(page);
    });
  }

  it('refuses an engineer the admin pages with a "not allowed" message', async () => {
    const { page } = browser;
    await signIn(page, 'engineer@specimetry.test', DEMO_PASSWORD);
    await page.goto('/admin/users');
    await page.getByTestId('not-allowed').waitFor();
    expect(new URL(page.url()).pathname).toBe('/not-allowed');
    expect(await page.getByTestId('not-allowed').textContent()).toContain('Not allowed');
    await screenshot(page, 'engineer-not-allowed');

    // The API refuses as well, whatever the client shows.
    const res = await page.request.get('/api/users');
    expect(res.status()).toBe(403);
    await page.goto('/studies');
    await signOut(page);
  });

  it('brings a signed-out visitor back to the page they asked for after sign-in', async () => {
    const { page } = browser;
    await page.goto('/admin/invitations');
    await page.waitForURL(/\/sign-in\?returnUrl=%2Fadmin%2Finvitations/);
    await signIn(page, 'admin@specimetry.test', DEMO_PASSWORD);
    expect(new URL(page.url()).pathname).toBe('/admin/invitations');
    await page.getByRole('heading', { name: 'Invitations', exact: true }).waitFor();
    await signOut(page);
  });

  it('says plainly when the e-mail or password is wrong', async () => {
    const { page } = browser;
    await page.goto('/sign-in');
    await page.locator('input[name=email]').fill('engineer@specimetry.test');
    await page.locator('input[name=password]').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    // API contract (issue 2): 401 {message: "E-mail or password is not correct"}.
    await page.getByTestId('form-error').getByText('E-mail or password is not correct').waitFor();
    await screenshot(page, 'sign-in-wrong-password');
  });

  it('remembers the dark colour scheme chosen in the top bar across a reload', async () => {
    const { page } = browser;
    await signIn(page, 'statistician@specimetry.test', DEMO_PASSWORD);
    await page.goto('/account');
    await page.getByRole('button', { name: 'Choose light or dark colours' }).click();
    await page.getByRole('menuitemradio', { name: 'Dark' }).click();
    await page.reload();
    await page.getByRole('heading', { name: 'Your account' }).waitFor();
    expect(await page.evaluate(() => document.documentElement.style.colorScheme)).toBe('dark');
    // The theme's light-dark() surfaces must actually switch: a dark page background (channel sum < 150 of 765).
    const background = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
    const channels = (background.match(/\d+/g) ?? []).slice(0, 3).map(Number);
    expect(channels.reduce((a, b) => a + b, 0)).toBeLessThan(150);
    await screenshot(page, 'account-dark');
    await page.getByRole('button', { name: 'Choose light or dark colours' }).click();
    await page.getByRole('menuitemradio', { name: 'Follow the system' }).click();
    await signOut(page);
  });
});
