import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, DEMO_PASSWORD, launchBrowser, screenshot as save, signIn } from './browser';

/** Full-page screenshots from the top, so the sticky top bar is not captured mid-page. */
async function screenshot(page: Page, name: string): Promise<void> {
  await page.evaluate('window.scrollTo(0, 0)');
  await save(page, name);
}

// The Hill 1948 calculator in a real browser. Expected: for r0 = r45 = r90 = 1 (isotropy) the free
// neck in uniaxial tension lies at arctan √2 = 54.74° from the tensile axis (R. Hill, J. Mech. Phys.
// Solids 1 (1952) 19–30), and F = G = H = 1/2, N = 3/2 under G + H = 1 (Hill 1948).

describe('Hill 1948 calculator', () => {
  let browser: Browser;

  beforeAll(async () => {
    browser = await launchBrowser(inject('baseUrl'));
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('opens from the navigation, takes the isotropic triple and shows the 54.74° free neck and the yield loci', async () => {
    const { page } = browser;
    await signIn(page, 'engineer@specimetry.test', DEMO_PASSWORD);
    await page.locator('[data-nav="/calc/hill48"]').click();
    await page.waitForURL(/\/calc\/hill48$/);
    await page.getByRole('heading', { name: 'Hill 1948 calculator' }).waitFor();
    for (const k of ['r0', 'r45', 'r90']) await page.locator(`input[name=${k}]`).fill('1');
    await page.getByRole('button', { name: 'Calculate' }).click();
    await page.getByTestId('free-neck-angle').getByText('54.74°').waitFor();
    expect(await page.getByTestId('coefficients').textContent()).toContain('0.5000, 0.5000, 0.5000, 1.5000');
    // The chart is drawn: the SVG renderer puts the two loci in as paths.
    const chart = page.getByTestId('locus-chart');
    await chart.locator('svg path').first().waitFor({ state: 'attached' });
    expect(await chart.locator('svg path').count()).toBeGreaterThan(4);
    expect(await page.getByTestId('calc-cautions').textContent()).toContain('not standard tensile specimens');
    await screenshot(page, 'calc-hill48');

    // A refusal is said beside the inputs.
    await page.locator('input[name=r0]').fill('0');
    await page.getByRole('button', { name: 'Calculate' }).click();
    await page.getByTestId('hill-error').getByText('r0 = 0 is not admissible').waitFor();

    // Readable in dark mode as well.
    await page.locator('input[name=r0]').fill('1.8');
    await page.getByRole('button', { name: 'Calculate' }).click();
    await page.getByTestId('free-neck-angle').waitFor();
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.getByRole('button', { name: 'Predict φ' }).click();
    await page.getByTestId('predicted-angle').waitFor();
    await screenshot(page, 'calc-hill48-dark');
    await page.emulateMedia({ colorScheme: 'light' });
  });

  it('computes a run\'s angle from an uploaded two-point history, stores the plateau with provenance, and derives H', async () => {
    const { page } = browser;
    const { studyId, runId } = await seedStudy(page);
    await page.goto(`/studies/${studyId}/runs/${runId}/angle`);
    await page.getByRole('heading', { name: /Relative-displacement angle/ }).waitFor();
    await page.getByTestId('history-file').setInputFiles({ name: 'points.csv', mimeType: 'text/csv', buffer: Buffer.from(historyCsv()) });
    // Synthetic rigid relative motion (constructed, exact): maximum 45°, plateau 35°.
    await page.getByTestId('angle-max').getByText('45.000°').waitFor();
    expect(await page.getByTestId('angle-plateau').textContent()).toContain('35.000°');
    await page.getByTestId('angle-chart').locator('svg path').first().waitFor({ state: 'attached' });
    await page.getByTestId('store-angle').click();
    await page.getByTestId('provenance').getByText('35.0000°').waitFor();
    expect(await page.getByTestId('provenance').textContent()).toContain('calc-');
    await screenshot(page, 'calc-run-angle');

    await page.goto(`/studies/${studyId}/derived`);
    await page.getByRole('heading', { name: 'Derived responses' }).waitFor();
    await page.getByRole('button', { name: 'Preview' }).click();
    await page.getByRole('table', { name: 'Estimated H per run' }).waitFor();
    await page.getByText('no value of phi recorded for this run yet').first().waitFor();
    await screenshot(page, 'calc-derived');
  });
});

/** Point 2 moves relative to point 1 in steps whose directions rise to 45° and settle at 35°. */
function historyCsv(): string {
  const angles = [...Array.from({ length: 10 }, (_, i) => 20 + 2.5 * i), 45, 41, 38, ...Array.from({ length: 30 }, () => 35)];
  const lines = ['frame,u1x,u1y,u2x,u2y'];
  let dx = 0;
  let dy = 0;
  angles.forEach((a, k) => {
    if (k === 0) lines.push('0,0,0,0,0');
    dx += 0.02 * Math.cos((a * Math.PI) / 180);
    dy += 0.02 * Math.sin((a * Math.PI) / 180);
    lines.push(`${k + 1},${0.05 * (k + 1)},0,${0.05 * (k + 1) + dx},${dy}`);
  });
  return lines.join('\n') + '\n';
}

/** A study with a neck-angle factor, an angle response and a committed plan, through the API as the signed-in engineer. */
async function seedStudy(page: Page): Promise<{ studyId: number; runId: number }> {
  await page.goto('/studies');
  const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  const headers = { 'X-XSRF-TOKEN': decodeURIComponent(xsrf) };
  const call = async (method: 'post' | 'put', url: string, data: unknown) => {
    const res = await page.request[method](url, { data, headers });
    if (!res.ok()) throw new Error(`${method} ${url}: ${res.status()} ${await res.text()}`);
    return res.json();
  };
  const { study } = await call('post', '/api/studies', { title: 'Grooved strips, neck angle', orientationDeg: 0 });
  await call('put', `/api/studies/${study.id}/factors`, { factors: [{ name: 'Groove angle', symbol: 'theta', unit: 'deg', kind: 'numeric', levels: [{ value: '55' }, { value: '60' }] }] });
  await call('put', `/api/studies/${study.id}/responses`, { responses: [{ name: 'Relative-displacement angle', symbol: 'phi', unit: 'deg', decimals: 2, goal: 'scatter' }] });
  await call('post', `/api/studies/${study.id}/plan`, { design: 'full', replicates: 2, randomise: false });
  const sheet = await (await page.request.get(`/api/studies/${study.id}/runs`)).json();
  return { studyId: study.id, runId: sheet.runs[0].id };
}
