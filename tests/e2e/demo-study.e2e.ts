import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, DEMO_PASSWORD, launchBrowser, screenshot, signIn } from './browser';

/**
 * The seeded demo study (server/services/demo-study.ts, invented data) as a statistician first sees
 * it: 3 × 3 × 2 full factorial, 3 replicates (54 runs), four invalid specimens; the generating model
 * has a real w × th interaction. Expected counts and chart shapes follow from that design (common
 * practice, no source); the F test behind the w:th row is the engine's, checked against R in
 * server/stats.
 */
describe('the demo study, analysed', () => {
  let b: Browser;

  beforeAll(async () => {
    b = await launchBrowser(inject('baseUrl'));
    await signIn(b.page, 'statistician@specimetry.test', DEMO_PASSWORD);
  });
  afterAll(async () => {
    await b?.close();
  });

  it('shows counts, the interaction chart with one line per th level and the w:th row significant', async () => {
    const page = b.page;
    await page.goto('/studies');
    await page.getByText('(demo, invented data)').first().click();
    await page.locator('[data-tab=analysis]').click();
    await page.waitForURL((url) => url.pathname.endsWith('/analysis'));
    await page.getByTestId('summary').waitFor();

    const counts = page.getByTestId('run-counts');
    expect(await counts.locator('[data-count=used]').textContent()).toBe('50');
    expect(await counts.locator('[data-count=excluded]').textContent()).toBe('4');

    // w and th have 3 levels each: 3 lines of 3 points, both ways round
    const chart = page.locator('[data-chart="interaction:w:th"][data-line-series]');
    await chart.waitFor();
    expect(await chart.getAttribute('data-line-series')).toBe('3');
    expect(await chart.getAttribute('data-line-points')).toBe('3,3,3');
    const mirror = page.locator('[data-chart="interaction:th:w"][data-line-series]');
    await mirror.waitFor();
    expect(await mirror.getAttribute('data-line-series')).toBe('3');

    const row = page.locator('tr[data-source="w:th"]');
    expect(await row.getByTestId('significance').textContent()).toBe('Significant');
    // the cautions that go with every result are on the page
    await page.getByTestId('caution').first().waitFor();
    await screenshot(page, 'demo-study-analysis');
  });

  it('revalidates the run sheet on a later visit instead of downloading it again (If-None-Match)', async () => {
    // RFC 9111 §4.3.1 / RFC 9110 §13.1.2: a stored response with an ETag is revalidated with
    // If-None-Match; the server's answer is `private, no-cache` + weak ETag (docs/api-studies.md).
    const page = b.page;
    const asked: (string | undefined)[] = [];
    const listen = (r: import('playwright-core').Request) => {
      if (/\/api\/studies\/\d+\/runs\?/.test(r.url())) void r.allHeaders().then((h) => asked.push(h['if-none-match']));
    };
    page.on('request', listen);
    await page.locator('[data-tab=runs]').click();
    await page.locator('ag-grid-angular [role=row][row-index="0"]').first().waitFor();
    await page.locator('[data-tab=plan]').click();
    await page.locator('[data-tab=runs]').click();
    await page.locator('ag-grid-angular [role=row][row-index="0"]').first().waitFor();
    await expect.poll(() => asked.length).toBeGreaterThanOrEqual(2);
    page.off('request', listen);
    expect(asked.at(-1)).toMatch(/^W\/".+"$/);
  });
});
