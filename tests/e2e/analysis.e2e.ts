import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, DEMO_PASSWORD, launchBrowser, screenshot, signIn, signOut } from './browser';

const ENGINEER = 'engineer@specimetry.test';
const STATISTICIAN = 'statistician@specimetry.test';
const SUPERVISOR = 'supervisor@specimetry.test';

/**
 * The demo scenario (invented): grooved strips at three neck width ratios W and two notch-root radius
 * ratios R, three replicates, Hill's H as response. The cell means cross (H rises with W at the small
 * radius and falls at the large one), so the W:R interaction is clear. One run broke brittle.
 */
const CELL_MEANS: Record<string, Record<string, number>> = {
  '0.4': { '0.5': 1.1, '1.0': 1.3 },
  '0.6': { '0.5': 1.22, '1.0': 1.26 },
  '0.8': { '0.5': 1.35, '1.0': 1.18 },
};

interface RunRow {
  id: number;
  version: number;
  settings: Record<string, string>;
}

async function api(page: Page) {
  const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const headers = { 'X-XSRF-TOKEN': decodeURIComponent(xsrf) };
  return async (method: 'post' | 'put' | 'get', url: string, data?: unknown) => {
    const res = await page.request[method](url, { data, headers });
    if (!res.ok()) throw new Error(`${method} ${url}: ${res.status()} ${await res.text()}`);
    return res.json();
  };
}

/** Set-up through the API as the engineer: study, factors, response, plan, results, reviewers. */
async function seedStudy(page: Page): Promise<number> {
  await page.goto('/studies');
  const call = await api(page);
  const { study } = await call('post', '/api/studies', { title: 'Grooved strips: neck width and root radius', materialGrade: 'DC04', thicknessMm: 1 });
  const sid = study.id as number;
  await call('put', `/api/studies/${sid}/factors`, {
    factors: [
      { name: 'Neck width ratio', symbol: 'W', kind: 'numeric', levels: [{ value: '0.4' }, { value: '0.6' }, { value: '0.8' }] },
      { name: 'Root radius ratio', symbol: 'R', kind: 'numeric', levels: [{ value: '0.5' }, { value: '1.0' }] },
    ],
  });
  await call('put', `/api/studies/${sid}/responses`, { responses: [{ name: 'Hill parameter H', symbol: 'H', decimals: 3, goal: 'nominal', target: 1.25 }] });
  await call('post', `/api/studies/${sid}/plan`, { design: 'full', replicates: 3, randomise: false });
  const sheet = (await call('get', `/api/studies/${sid}/runs`)) as { runs: RunRow[] };
  const { outcomes } = (await call('get', `/api/studies/${sid}/outcomes`)) as { outcomes: { id: number; label: string }[] };
  const brittle = outcomes.find((o) => o.label === 'brittle fracture')?.id;
  let brittleUsed = false;
  const edits = sheet.runs.map((run, i) => {
    const mean = CELL_MEANS[String(run.settings['W'])][String(run.settings['R'])];
    const value = (mean + (((i * 7) % 5) - 2) * 0.012).toFixed(3);
    const edit: Record<string, unknown> = { runId: run.id, version: run.version, values: { H: value } };
    if (!brittleUsed && run.settings['W'] === '0.8' && run.settings['R'] === '1.0') {
      edit['outcomeId'] = brittle;
      brittleUsed = true;
    }
    return edit;
  });
  await call('post', `/api/studies/${sid}/runs/batch`, { edits, reason: 'bench results' });
  await call('post', `/api/studies/${sid}/members`, { email: STATISTICIAN, role: 'reviewer' });
  await call('post', `/api/studies/${sid}/members`, { email: SUPERVISOR, role: 'reviewer' });
  return sid;
}

async function chooseScheme(page: Page, label: 'Light' | 'Dark'): Promise<void> {
  await page.getByRole('button', { name: 'Choose light or dark colours' }).click();
  await page.getByRole('menuitemradio', { name: label }).click();
}

// One journey: the engineer analyses the study and asks for a review, the statistician follows the
// mailed link and comments on the interaction row, the supervisor approves, and the report downloads.
describe('analysis, review and sign-off', () => {
  let user: Browser;
  let admin: Browser;
  let studyId = 0;
  let analysisLink = '';

  beforeAll(async () => {
    const baseUrl = inject('baseUrl');
    user = await launchBrowser(baseUrl);
    admin = await launchBrowser(baseUrl);
    await signIn(user.page, ENGINEER, DEMO_PASSWORD);
    await signIn(admin.page, 'admin@specimetry.test', DEMO_PASSWORD);
    studyId = await seedStudy(user.page);
  });
  afterAll(async () => {
    await user?.close();
    await admin?.close();
  });

  it('analyses the study live and draws the two-factor interaction with its mirror', async () => {
    const page = user.page;
    await page.goto(`/studies/${studyId}`);
    await page.locator('[data-tab=analysis]').click();
    await page.waitForURL((url) => url.pathname === `/studies/${studyId}/analysis`);
    await page.getByTestId('summary').waitFor();

    // 18 runs planned, one brittle fracture excluded (the seed above)
    const counts = page.getByTestId('run-counts');
    expect(await counts.locator('[data-count=used]').textContent()).toBe('17');
    expect(await counts.locator('[data-count=excluded]').textContent()).toBe('1');

    // W has 3 levels and R 2: lines per R level across W, and the mirror with lines per W level
    const chart = page.locator('[data-chart="interaction:W:R"][data-line-series]');
    await chart.waitFor();
    expect(await chart.getAttribute('data-line-series')).toBe('2');
    expect(await chart.getAttribute('data-line-points')).toBe('3,3');
    const mirror = page.locator('[data-chart="interaction:R:W"][data-line-series]');
    await mirror.waitFor();
    expect(await mirror.getAttribute('data-line-series')).toBe('3');
    expect(await mirror.getAttribute('data-line-points')).toBe('2,2,2');
    expect(await page.locator('[data-chart="interaction:W:R"] .caption').textContent()).toMatch(/W:R: F\(2, 11\) = [\d.]+, p [=<]/);

    // the crossing means make W:R significant; the row says so in words, not only colour
    const interaction = page.locator('tr[data-source="W:R"]');
    expect(await interaction.getAttribute('class')).toContain('significant');
    expect(await interaction.getByTestId('significance').textContent()).toBe('Significant');
    await page.getByTestId('caution').first().waitFor();

    await chooseScheme(page, 'Light');
    await page.locator('[data-chart="main-effects"][data-line-series]').waitFor();
    await screenshot(page, 'analysis-light');
    await chooseScheme(page, 'Dark');
    await page.waitForTimeout(600); // charts re-render with the dark palette (animation 300 ms); a picture, not an assertion
    await screenshot(page, 'analysis-dark');
    await chooseScheme(page, 'Light');
  });

  it('saves the analysis and requests a review from both reviewers', async () => {
    const page = user.page;
    await page.locator('input[name=title]').fill('H by W and R, two-way');
    await page.getByRole('button', { name: 'Save analysis' }).click();
    await page.waitForURL((url) => /\/analyses\/\d+$/.test(url.pathname));
    analysisLink = new URL(page.url()).pathname;
    expect(await page.getByTestId('analysis-status').textContent()).toContain('Draft');
    await page.getByRole('button', { name: 'Request review' }).click();
    await page.getByTestId('analysis-status').getByText('In review').waitFor();
    await screenshot(page, 'analysis-in-review');
  });

  it('lets the statistician follow the mailed link and comment on the interaction row', async () => {
    // The reviewer's mail, read in the fake mailbox (admin outbox page), as in mail-flows.e2e.ts.
    let mailId = 0;
    await expect
      .poll(
        async () => {
          const res = await admin.page.request.get('/api/mail/outbox');
          const { messages } = (await res.json()) as { messages: { id: number; recipients: string | string[] }[] };
          mailId = messages.filter((m) => [m.recipients].flat().join(',').includes(STATISTICIAN)).reduce((max, m) => Math.max(max, m.id), 0);
          return mailId;
        },
        { timeout: 15_000 },
      )
      .toBeGreaterThan(0);
    await admin.page.goto(`/admin/outbox/${mailId}`);
    const link = admin.page.locator('[data-testid=mail-body] a').filter({ hasText: analysisLink });
    await link.first().waitFor();
    const href = (await link.first().getAttribute('href')) ?? '';
    expect(new URL(href).pathname).toBe(analysisLink);

    const page = user.page;
    await signOut(page);
    await signIn(page, STATISTICIAN, DEMO_PASSWORD);
    await page.goto(href);
    await page.locator('tr[data-source="W:R"] td.comment button').click();
    expect(await page.getByTestId('comment-anchor').textContent()).toContain('ANOVA row W:R');
    await page.locator('textarea[name=comment]').fill('The W:R interaction is strong; please add a confirmation run at W = 0.6, R = 1.0.');
    await page.getByRole('button', { name: 'Post comment' }).click();
    await page.locator('[data-anchor="anova:W:R"]').getByText('confirmation run').waitFor();
    // The supervisor's sign-off buttons are not offered to a statistician.
    expect(await page.getByRole('button', { name: 'Approve analysis' }).count()).toBe(0);
  });

  it('lets the supervisor approve, freezes the analysis and downloads the report', async () => {
    const page = user.page;
    await signOut(page);
    await signIn(page, SUPERVISOR, DEMO_PASSWORD);
    await page.getByTestId('notification-bell').click();
    await page.locator('[data-notification=review-request]').first().click();
    await page.waitForURL((url) => url.pathname === analysisLink);
    await page.getByRole('button', { name: 'Approve analysis' }).click();
    await page.getByRole('button', { name: 'Approve analysis' }).click();
    await page.getByTestId('frozen-note').waitFor();
    expect(await page.getByTestId('analysis-status').textContent()).toContain('Approved');
    await screenshot(page, 'analysis-approved');

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('report-pdf').click()]);
    expect(download.suggestedFilename()).toMatch(/\.pdf$/);
    const file = await download.path();
    expect(readFileSync(file).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const html = await page.request.get((await page.getByTestId('report-page').getAttribute('href')) ?? '');
    expect(html.status()).toBe(200);
    expect(html.headers()['content-type']).toContain('text/html');
  });

  it('marks the approved analysis STALE after a run is edited, and lists the change', async () => {
    const page = user.page;
    await signOut(page);
    await signIn(page, ENGINEER, DEMO_PASSWORD);
    const call = await api(page);
    const sheet = (await call('get', `/api/studies/${studyId}/runs`)) as { runs: (RunRow & { code: string })[] };
    const run = sheet.runs[0];
    await call('post', `/api/studies/${studyId}/runs/batch`, { edits: [{ runId: run.id, version: run.version, values: { H: '1.111' } }], reason: 're-measured' });
    await page.goto(analysisLink);
    const banner = page.getByTestId('stale-banner');
    await banner.waitFor();
    expect(await banner.textContent()).toContain(run.code);
    expect(await page.getByTestId('stale-chip').count()).toBe(1);
    // the study header and the studies list say it too, wherever the study is shown as approved
    expect(await page.getByTestId('changed-since-approval').textContent()).toContain('Data changed since approval');
    await screenshot(page, 'analysis-stale');
    await page.goto('/studies');
    await page.getByTestId('changed-since-approval').first().waitFor();
    await screenshot(page, 'studies-changed-since-approval');
  });
});
