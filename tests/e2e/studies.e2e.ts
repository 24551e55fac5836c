import { createHash } from 'node:crypto';
import type { Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, DEMO_PASSWORD, launchBrowser, screenshot, signIn, signOut } from './browser';

/**
 * One engineer's day on a new study, in the order a person works (issue 4): create the study, set up
 * two factors and two responses, commit a replicated 2x2 plan, type values, paste a block (and undo
 * it once), import a CSV that has one bad row, attach a file, add a viewer; then the viewer finds
 * everything read-only. The scenario is invented.
 */
const TITLE = `Grooved strip e2e ${Date.now()}`;

/** A grid cell by displayed row index and column id (the centre and pinned parts share row-index). */
function cell(page: Page, rowIndex: number, colId: string): Locator {
  return page.locator(`ag-grid-angular [role=row][row-index="${rowIndex}"] [role=gridcell][col-id="${colId}"]`);
}

async function count(page: Page, testId: string): Promise<string> {
  return ((await page.getByTestId(testId).textContent()) ?? '').trim();
}

async function waitForCount(page: Page, testId: string, expected: string): Promise<void> {
  await page.waitForFunction(
    ([id, want]) => document.querySelector(`[data-testid="${id}"]`)?.textContent?.trim() === want,
    [testId, expected] as const,
  );
}

async function fillFactor(page: Page, index: number, f: { name: string; symbol: string; unit: string; levels: [string, string] }) {
  const box = page.locator(`[data-factor="${index}"]`);
  await box.locator('input[formcontrolname=name]').fill(f.name);
  await box.locator('input[formcontrolname=symbol]').fill(f.symbol);
  await box.locator('input[formcontrolname=unit]').fill(f.unit);
  const levels = box.locator('[formarrayname=levels] input[formcontrolname=value]');
  await levels.nth(0).fill(f.levels[0]);
  await levels.nth(1).fill(f.levels[1]);
}

async function fillResponse(page: Page, index: number, r: { name: string; symbol: string; unit: string; decimals: string; min: string; max: string }) {
  const box = page.locator(`[data-response="${index}"]`);
  await box.locator('input[formcontrolname=name]').fill(r.name);
  await box.locator('input[formcontrolname=symbol]').fill(r.symbol);
  await box.locator('input[formcontrolname=unit]').fill(r.unit);
  await box.locator('input[formcontrolname=decimals]').fill(r.decimals);
  await box.locator('input[formcontrolname=rangeMin]').fill(r.min);
  await box.locator('input[formcontrolname=rangeMax]').fill(r.max);
}

/** Puts TSV on the real clipboard and presses Ctrl+V on the focused grid cell, as a user would. */
async function pasteTsv(page: Page, text: string): Promise<void> {
  await page.evaluate((t) => navigator.clipboard.writeText(t), text);
  await page.keyboard.press('Control+V');
}

describe('studies: an engineer sets up, plans, records and imports; a viewer only reads', () => {
  let browser: Browser;
  let page: Page;
  let studyPath = '';

  beforeAll(async () => {
    const baseUrl = inject('baseUrl');
    browser = await launchBrowser(baseUrl);
    await browser.context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: baseUrl });
    page = browser.page;
    await signIn(page, 'engineer@specimetry.test', DEMO_PASSWORD);
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('creates a study from the list and lands on its set-up', async () => {
    await page.getByTestId('new-study').click();
    const dialog = page.getByRole('dialog');
    // Submitting without a title says what to enter.
    await dialog.getByRole('button', { name: 'Create study' }).click();
    await dialog.getByText('Enter a title').waitFor();
    await dialog.locator('input[name=title]').fill(TITLE);
    await dialog.locator('input[name=specimenFamily]').fill('grooved strip');
    await dialog.locator('input[name=materialGrade]').fill('Invented alloy AX-3');
    await dialog.locator('input[name=batch]').fill('Coil 7');
    await dialog.locator('input[name=thicknessMm]').fill('1,2');
    await dialog.getByRole('button', { name: 'Create study' }).click();
    await dialog.getByText('"1,2": use a point as the decimal mark').waitFor();
    await dialog.locator('input[name=thicknessMm]').fill('1.20');
    await dialog.locator('input[name=orientationDeg]').fill('90');
    await screenshot(page, 'studies-new-dialog');
    await dialog.getByRole('button', { name: 'Create study' }).click();
    await page.waitForURL(/\/studies\/\d+\/setup$/);
    studyPath = new URL(page.url()).pathname.replace(/\/setup$/, '');
    expect(await page.getByTestId('study-title').textContent()).toContain(TITLE);
  });

  it('adds two factors and two responses with validation on the way', async () => {
    await page.getByTestId('add-factor').click();
    await page.getByTestId('add-factor').click();
    await fillFactor(page, 0, { name: 'Neck width ratio', symbol: 'w', unit: '', levels: ['0.3', '0.6'] });
    await fillFactor(page, 1, { name: 'Notch-root radius', symbol: 'w', unit: 'mm', levels: ['0.5', '2,0'] });
    await page.getByTestId('save-factors').click();
    // The shared schema's messages sit on the fields to fix.
    await page.getByText('Symbol "w" is used twice').waitFor();
    await page.getByText('Level "2,0" of a numeric factor must be a number (use a point as decimal mark)').waitFor();
    await screenshot(page, 'studies-setup-errors');
    await page.locator('[data-factor="1"] input[formcontrolname=symbol]').fill('r');
    await page.locator('[data-factor="1"] [formarrayname=levels] input[formcontrolname=value]').nth(1).fill('2.0');
    await page.getByTestId('save-factors').click();
    await page.getByText('Factors saved').waitFor();

    await page.getByTestId('add-response').click();
    await page.getByTestId('add-response').click();
    await fillResponse(page, 0, { name: 'Anisotropy parameter H', symbol: 'H', unit: '', decimals: '3', min: '0.5', max: '2' });
    await fillResponse(page, 1, { name: 'Neck angle', symbol: 'psi', unit: 'deg', decimals: '1', min: '30', max: '80' });
    await page.getByTestId('save-responses').click();
    await page.getByText('Responses saved').waitFor();
    await screenshot(page, 'studies-setup');
  });

  it('previews the plan live and commits it', async () => {
    await page.locator('[data-tab=plan]').click();
    await page.locator('input[name=replicates]').fill('2');
    // 2 factors x 2 levels x 2 replicates = 8 runs (full factorial: product of levels times replicates).
    await waitForCount(page, 'preview-run-count', '8');
    await page.getByTestId('power-table').waitFor();
    await screenshot(page, 'studies-plan-preview');
    await page.getByTestId('commit-plan').click();
    await page.waitForURL(/\/runs$/);
    await cell(page, 7, 'val:H').waitFor();
    expect(await count(page, 'count-planned')).toBe('8');
    expect(await count(page, 'count-recorded')).toBe('0');
  });

  it('types values into the grid and flags one outside the plausible range', async () => {
    await cell(page, 0, 'val:H').click();
    await page.keyboard.type('0.912');
    await page.keyboard.press('Enter');
    await waitForCount(page, 'count-recorded', '1');
    expect((await cell(page, 0, 'val:H').textContent())?.trim()).toBe('0.912');

    // Too many decimals for H (3) is refused before sending.
    await cell(page, 1, 'val:H').click();
    await page.keyboard.type('0.9123');
    await page.keyboard.press('Enter');
    await page.getByText('has more than 3 decimals').first().waitFor();
    await page.getByRole('button', { name: 'Dismiss' }).click();

    // 2.500 is outside the plausible range 0.5–2 for H: stored, but marked.
    await cell(page, 0, 'val:psi').click();
    await page.keyboard.type('95.5');
    await page.keyboard.press('Enter');
    await page.locator('[role=gridcell][col-id="val:psi"].sm-out-of-range').first().waitFor();
    await screenshot(page, 'studies-grid-typed');
  });

  it('pastes a block from the focused cell, then undoes it once', async () => {
    await cell(page, 1, 'val:H').click();
    await pasteTsv(page, '0.905\t61.5\r\n0.887\t60.2\r\n');
    await page.getByTestId('paste-done').waitFor();
    await waitForCount(page, 'count-recorded', '3');
    expect((await cell(page, 2, 'val:psi').textContent())?.trim()).toBe('60.2');
    await screenshot(page, 'studies-grid-pasted');

    await page.getByTestId('undo-paste').click();
    await waitForCount(page, 'count-recorded', '1');
    expect(await page.getByTestId('undo-paste').count()).toBe(0);

    // A bad value anywhere in the block refuses all of it, saying where.
    await cell(page, 1, 'val:H').click();
    await pasteTsv(page, '0.905\t61.5\r\n0,887\t60.2\r\n');
    await page.getByTestId('paste-errors').getByText('use a point as the decimal mark').waitFor();
    expect(await count(page, 'count-recorded')).toBe('1');
    await screenshot(page, 'studies-grid-paste-refused');

    await cell(page, 1, 'val:H').click();
    await pasteTsv(page, '0.905\t61.5\r\n0.887\t60.2\r\n');
    await waitForCount(page, 'count-recorded', '3');
  });

  it('shows a conflict instead of overwriting when someone else saved the run first', async () => {
    // Another client (here: a fetch with the same account, behind the grid's back) saves R008 first.
    const studyId = Number(studyPath.split('/').pop());
    const stored = await page.evaluate(async (id) => {
      const xsrf = decodeURIComponent(document.cookie.match(/XSRF-TOKEN=([^;]+)/)?.[1] ?? '');
      const sheet = (await (await fetch(`/api/studies/${id}/runs`)).json()) as { runs: { id: number; code: string; version: number }[] };
      const run = sheet.runs.find((r) => r.code === 'R008')!;
      const res = await fetch(`/api/studies/${id}/runs/${run.id}`, {
        method: 'PATCH',
        headers: { 'content-type': 'application/json', 'x-xsrf-token': xsrf },
        body: JSON.stringify({ version: run.version, values: { H: '0.777' } }),
      });
      return res.status;
    }, studyId);
    expect(stored).toBe(200);
    const row = Number(await page.locator('ag-grid-angular [role=row]:has([col-id="code"]:text-is("R008"))').first().getAttribute('row-index'));
    await cell(page, row, 'val:H').click();
    await page.keyboard.type('0.901');
    await page.keyboard.press('Enter');
    await page.getByTestId('conflict').waitFor();
    expect((await page.getByTestId('conflict-theirs').textContent())?.trim()).toBe('0.777');
    expect((await page.getByTestId('conflict-mine').textContent())?.trim()).toBe('0.901');
    await screenshot(page, 'studies-grid-conflict');
    await page.getByRole('button', { name: 'Keep the stored value' }).click();
    // The grid shows what is stored, not what was typed.
    await page.waitForFunction(
      ([r]) => document.querySelector(`ag-grid-angular [role=row][row-index="${r}"] [col-id="val:H"]`)?.textContent?.trim() === '0.777',
      [row] as const,
    );
    await waitForCount(page, 'count-recorded', '4');
  });

  it('imports a CSV: sees the bad row, fixes the file, commits', async () => {
    await page.locator('[data-tab=import]').click();
    const bad = 'Run,H,psi\nR004,0.931,58.0\nR005,abc,57.5\nR006,0.948,59.1\n';
    await page.getByTestId('import-input').setInputFiles({ name: 'bench-results.csv', mimeType: 'text/csv', buffer: Buffer.from(bad) });
    await page.getByTestId('import-error-count').waitFor();
    expect(await page.getByTestId('import-errors').textContent()).toContain('abc');
    expect(await page.getByTestId('import-commit').isDisabled()).toBe(true);
    await screenshot(page, 'studies-import-error');

    const fixed = bad.replace('abc', '0.940');
    await page.getByTestId('import-input').setInputFiles({ name: 'bench-results-fixed.csv', mimeType: 'text/csv', buffer: Buffer.from(fixed) });
    await page.getByTestId('import-ready').waitFor();
    await page.getByTestId('import-commit').click();
    await page.getByTestId('import-done').waitFor();
    expect(await page.getByTestId('import-done').textContent()).toContain('6 values in 3 runs');
    await screenshot(page, 'studies-import-done');

    await page.locator('[data-tab=runs]').click();
    await waitForCount(page, 'count-recorded', '7');
  });

  it('uploads an attachment to a run and shows its SHA-256', async () => {
    const content = Buffer.from('increment,force_kN\n1,0.50\n2,0.97\n');
    const sha = createHash('sha256').update(content).digest('hex');
    await cell(page, 0, 'attachments').locator('[data-action=attachments]').click();
    const dialog = page.getByRole('dialog');
    await dialog.getByTestId('attachment-input').setInputFiles({ name: 'force-history.csv', mimeType: 'text/csv', buffer: content });
    await dialog.getByTestId('attachment-list').getByText('force-history.csv').waitFor();
    expect(await dialog.getByTestId('attachment-list').textContent()).toContain(sha.slice(0, 12));
    await screenshot(page, 'studies-attachment');
    await dialog.getByRole('button', { name: 'Close' }).click();
    await page.waitForFunction(() => document.querySelector('[row-index="0"] [col-id="attachments"] .count')?.textContent?.trim() === '1');
  });

  it('refuses to regenerate the plan now that runs hold results', async () => {
    await page.locator('[data-tab=plan]').click();
    await waitForCount(page, 'preview-run-count', '8');
    await page.getByTestId('commit-plan').click();
    await page.getByRole('dialog').getByRole('button', { name: 'Replace plan' }).click();
    await page.getByTestId('plan-refused').getByText('cannot be regenerated').waitFor();
    await screenshot(page, 'studies-plan-refused');
  });

  it('adds a supervisor as viewer', async () => {
    await page.locator('[data-tab=overview]').click();
    await page.locator('mat-select[name=member]').click();
    await page.getByRole('option', { name: /Priya Supervisor/ }).click();
    await page.locator('mat-select[name=memberRole]').click();
    await page.getByRole('option', { name: /^viewer/ }).click();
    await page.getByRole('button', { name: 'Add member' }).click();
    await page.getByRole('list', { name: 'Study members' }).getByText('Priya Supervisor').waitFor();
    await screenshot(page, 'studies-overview');
    await signOut(page);
  });

  it('a viewer sees the study but cannot edit anything', async () => {
    await signIn(page, 'supervisor@specimetry.test', DEMO_PASSWORD);
    expect(await page.getByTestId('new-study').count()).toBe(0);
    await page.getByRole('link', { name: TITLE }).click();
    await page.waitForURL(new RegExp(`${studyPath}/overview$`));
    expect(await page.getByRole('button', { name: 'Save description' }).count()).toBe(0);
    expect(await page.locator('input[name=title]').isDisabled()).toBe(true);

    await page.locator('[data-tab=runs]').click();
    await page.getByTestId('read-only-note').waitFor();
    expect(await count(page, 'count-recorded')).toBe('7');
    await cell(page, 3, 'val:H').dblclick();
    await page.keyboard.type('1.111');
    await page.keyboard.press('Enter');
    expect(await page.locator('ag-grid-angular .ag-cell-inline-editing').count()).toBe(0);
    expect((await cell(page, 3, 'val:H').textContent())?.trim()).toBe('0.931');
    expect(await page.locator('[data-action=remove]').count()).toBe(0);
    await screenshot(page, 'studies-viewer-sheet');

    await page.locator('[data-tab=setup]').click();
    expect(await page.getByTestId('save-factors').count()).toBe(0);
    expect(await page.getByTestId('add-factor').count()).toBe(0);
    await page.locator('[data-tab=audit]').click();
    await page.waitForURL(new RegExp(`${studyPath}/audit$`));
    await page.getByTestId('audit-table').getByText('Elin Engineer').first().waitFor();
    await screenshot(page, 'studies-audit');
  });
});
