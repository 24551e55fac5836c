import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, DEMO_PASSWORD, launchBrowser, screenshot, signIn, signOut } from './browser';

interface OutboxItem {
  id: number;
  recipients: string | string[];
  subject: string;
  receivedAt: string;
}

const INVITEE = { email: 'nadia.invitee@lab.example', name: 'Nadia Invitee' };
const FIRST_PASSWORD = 'grooved strips at dawn';
const SECOND_PASSWORD = 'notch radius over thickness';

// One journey, in order: an administrator invites a person, the person accepts through the link in the
// mail (read from the built-in fake mailbox), later forgets the password and resets it the same way.
describe('accounts by e-mail link', () => {
  let admin: Browser;
  let invitee: Browser;
  let baseUrl: string;

  beforeAll(async () => {
    baseUrl = inject('baseUrl');
    admin = await launchBrowser(baseUrl);
    invitee = await launchBrowser(baseUrl);
    await signIn(admin.page, 'admin@specimetry.test', DEMO_PASSWORD);
  });
  afterAll(async () => {
    await admin?.close();
    await invitee?.close();
  });

  /**
   * The newest mail to `to`, read as the administrator: found through GET /api/mail/outbox, then opened
   * on the outbox page, whose body link is returned (the link a user would click).
   */
  async function linkFromLatestMail(to: string, pathPrefix: string, shot: string): Promise<string> {
    const page = admin.page;
    let latest: OutboxItem | undefined;
    // Mail goes through real SMTP to the fake server, so it can land a moment after the API answered.
    await expect
      .poll(
        async () => {
          const res = await page.request.get('/api/mail/outbox');
          expect(res.status()).toBe(200);
          const { messages } = (await res.json()) as { messages: OutboxItem[] };
          latest = messages
            .filter((m) => [m.recipients].flat().join(',').includes(to) && m.subject !== '')
            .sort((a, b) => b.id - a.id)
            .find(() => true);
          return latest ? latest.id : 0;
        },
        { timeout: 15_000 },
      )
      .toBeGreaterThan(0);

    await page.goto('/admin/outbox');
    await page.locator(`[data-mail*="${to}"]`).first().waitFor();
    await screenshot(page, 'outbox-list');
    await page.goto(`/admin/outbox/${latest?.id}`);
    const link = page.locator('[data-testid=mail-body] a').filter({ hasText: pathPrefix });
    await link.first().waitFor();
    await screenshot(page, shot);
    const href = await link.first().getAttribute('href');
    expect(href?.startsWith(`${baseUrl}${pathPrefix}?token=`)).toBe(true);
    return href ?? '';
  }

  it('lets an administrator invite a person by e-mail', async () => {
    const page = admin.page;
    await page.goto('/admin/invitations');
    await page.locator('input[name=email]').fill(INVITEE.email);
    await page.locator('input[name=name]').fill(INVITEE.name);
    await page.locator('mat-select[name=role]').click();
    await page.getByRole('option', { name: 'Statistician' }).click();
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByTestId('invitation-sent').getByText(INVITEE.email).waitFor();
    const row = page.locator(`[data-invitation="${INVITEE.email}"]`);
    await row.getByText('Waiting').waitFor();
    await screenshot(page, 'invitations');
  });

  it('signs the invited person in after they accept through the mailed link', async () => {
    const link = await linkFromLatestMail(INVITEE.email, '/accept-invitation', 'mail-invitation');
    const page = invitee.page;
    await page.goto(link);
    expect(await page.getByTestId('invited-email').textContent()).toBe(INVITEE.email);
    expect(await page.locator('input[name=name]').inputValue()).toBe(INVITEE.name);
    await page.locator('input[name=password]').fill(FIRST_PASSWORD);
    await page.locator('input[name=confirm]').fill(FIRST_PASSWORD);
    await screenshot(page, 'accept-invitation');
    await page.getByRole('button', { name: 'Create my account' }).click();
    await page.waitForURL((url) => url.pathname === '/studies');
    expect(await page.getByTestId('signed-in-user').textContent()).toContain(INVITEE.name);
    expect((await page.getByTestId('signed-in-role').textContent())?.trim()).toBe('Statistician');

    // The administrator sees the invitation used and the new account.
    await admin.page.goto('/admin/invitations');
    await admin.page.locator(`[data-invitation="${INVITEE.email}"]`).getByText('Accepted').waitFor();
    await admin.page.goto('/admin/users');
    await admin.page.locator(`[data-user="${INVITEE.email}"]`).waitFor();
    await screenshot(admin.page, 'users');
  });

  it('refuses the same invitation link a second time', async () => {
    const res = await invitee.page.request.get(
      `/api/invitations/lookup?token=${new URL(await linkFromLatestMail(INVITEE.email, '/accept-invitation', 'mail-invitation')).searchParams.get('token')}`,
    );
    expect([404, 410]).toContain(res.status());
  });

  it('resets a forgotten password through the mailed link', async () => {
    const page = invitee.page;
    await signOut(page);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.waitForURL((url) => url.pathname === '/reset-password');
    await page.locator('input[name=email]').fill(INVITEE.email);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await page.getByTestId('reset-sent').waitFor();
    await screenshot(page, 'reset-requested');

    const link = await linkFromLatestMail(INVITEE.email, '/reset-password', 'mail-reset');
    await page.goto(link);
    await page.locator('input[name=password]').fill(SECOND_PASSWORD);
    await page.locator('input[name=confirm]').fill(SECOND_PASSWORD);
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.waitForURL((url) => url.pathname === '/sign-in');

    // The old password no longer works; the new one does.
    await page.locator('input[name=email]').fill(INVITEE.email);
    await page.locator('input[name=password]').fill(FIRST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await page.getByTestId('form-error').waitFor();
    await signIn(page, INVITEE.email, SECOND_PASSWORD);
    expect(new URL(page.url()).pathname).toBe('/studies');

    // A reset link works once.
    await signOut(page);
    await page.goto(link);
    await page.locator('input[name=password]').fill('yet another long passphrase');
    await page.locator('input[name=confirm]').fill('yet another long passphrase');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.getByTestId('form-error').waitFor();
    await screenshot(page, 'reset-link-used');
  });

  it('lets the administrator change the role and deactivate the account, which ends its session', async () => {
    const page = admin.page;
    await signIn(invitee.page, INVITEE.email, SECOND_PASSWORD);
    await page.goto('/admin/users');
    const row = page.locator(`[data-user="${INVITEE.email}"]`);
    await row.locator('mat-select').click();
    await page.getByRole('option', { name: 'Supervisor' }).click();
    await page.getByText(`${INVITEE.name} is now Supervisor.`).waitFor();

    await row.getByRole('button', { name: 'Deactivate' }).click();
    await row.getByText('Deactivated').waitFor();
    await screenshot(page, 'users-deactivated');

    // Issue 2: a deactivated user's sessions end. The next call gets 401 and the app shows sign-in.
    await invitee.page.goto('/account');
    await invitee.page.waitForURL((url) => url.pathname === '/sign-in');
    await invitee.page.locator('input[name=email]').fill(INVITEE.email);
    await invitee.page.locator('input[name=password]').fill(SECOND_PASSWORD);
    await invitee.page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await invitee.page.getByTestId('form-error').waitFor();
  });
});
