import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { type BrowserContext, type Page, chromium } from 'playwright-core';

export const CHROMIUM_PATH = '/usr/bin/chromium';
const SCREENSHOTS = path.resolve('tests/e2e/screenshots');

export interface Browser {
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
}

/** Launches Debian Chromium exactly as STACK.md pitfall 10 says: a persistent context in a fresh profile. */
export async function launchBrowser(baseUrl: string): Promise<Browser> {
  const profile = mkdtempSync(path.join(tmpdir(), 'specimetry-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
    baseURL: baseUrl,
    viewport: { width: 1280, height: 800 },
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Saves tests/e2e/screenshots/<name>.png (gitignored) for people to look at. */
export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`), fullPage: true });
}

export const DEMO_PASSWORD = 'specimetry-demo';

/** Signs in through the form, as a user would, and waits until the app has left the sign-in page. */
export async function signIn(page: Page, email: string, password: string): Promise<void> {
  if (!page.url().includes('/sign-in')) await page.goto('/sign-in');
  await page.locator('input[name=email]').fill(email);
  await page.locator('input[name=password]').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((url) => url.pathname.startsWith('/sign-in'));
}

/** The navigation targets the shell shows, in order. */
export async function navTargets(page: Page): Promise<string[]> {
  await page.locator('[data-nav]').first().waitFor();
  return page.locator('[data-nav]').evaluateAll((links) => links.map((a) => a.getAttribute('data-nav') ?? ''));
}
