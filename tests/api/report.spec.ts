import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import type { AnovaEffectRow, AnovaRow } from '../../shared/analysis.js';
import { createUser } from '../../server/services/users.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { DEMO_EMAIL, signIn, startTestApp, type Client, type TestApp } from './harness.js';
import { insertStudy, rel, userId, warpbreaks, warpbreaksStudy } from './analysis-fixtures.js';

// The report (PDF and printable page) of R's warpbreaks data entered as a study: its ANOVA numbers
// are read back out of the PDF and compared with the engine's result and with R.

let t: TestApp;
let engineer: Client;
let supervisor: Client;
let outsider: Client;
let studyId: number;
let runIds: number[];
let aid: number;
let anova: AnovaRow[];
const ref = warpbreaks();

async function pdfText(who: Client, id: number): Promise<{ status: number; type: string; text: string }> {
  const res = await who.agent
    .get(`/api/analyses/${id}/report.pdf`)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
  if (res.status !== 200) return { status: res.status, type: String(res.headers['content-type']), text: '' };
  const parser = new PDFParse({ data: res.body as Buffer });
  const text = (await parser.getText()).text;
  await parser.destroy();
  return { status: res.status, type: String(res.headers['content-type']), text };
}

/** The numbers printed on the ANOVA row of `source` (the significance star dropped). */
function pdfRow(text: string, source: string): number[] {
  const line = text.split('\n').find((l) => l.startsWith(`${source} `) && /\d/.test(l) && !l.includes('('));
  if (!line) throw new Error(`no ANOVA row "${source}" in the PDF text`);
  return line.slice(source.length).split(/\s+/).filter((x) => /^-?[\d.]+(e[-+]?\d+)?$/.test(x)).map(Number);
}

beforeAll(async () => {
  t = await startTestApp();
  await createUser(t.ctx, { email: 'outsider@specimetry.test', name: 'Oli Outsider', role: 'engineer', password: DEMO_PASSWORD });
  ({ studyId, runIds } = insertStudy(t.ctx, { ...warpbreaksStudy([{ email: DEMO_EMAIL.supervisor, role: 'reviewer' }]), title: 'Warp breaks <b>as</b> a study' }));
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
  outsider = await signIn(t.app, { email: 'outsider@specimetry.test', password: DEMO_PASSWORD });
  const res = await engineer.post(`/api/studies/${studyId}/analyses`, { response: 'breaks', factors: ['W', 'T'] });
  aid = res.body.analysis.id;
  anova = res.body.analysis.result.anova;
});
afterAll(() => t.close());

describe('GET /api/analyses/:id/report.pdf', () => {
  it('a draft is watermarked and its ANOVA numbers match the engine and R', async () => {
    const pdf = await pdfText(engineer, aid);
    expect(pdf.status).toBe(200);
    expect(pdf.type).toContain('application/pdf');
    expect(pdf.text).toContain('DRAFT — this analysis is draft and not signed off.');
    // R 4.2.2 summary(aov(breaks ~ wool * tension, data = warpbreaks)) (shared/reference/r-datasets/warpbreaks.json);
    // printed to 6 significant digits, so agreement is to half a unit in the 6th digit (< 1e-5 relative).
    const names: Record<string, string> = { wool: 'W', tension: 'T', 'wool:tension': 'W:T', Residuals: 'Residual' };
    for (const r of ref.twoWay.table) {
      const nums = pdfRow(pdf.text, names[r.term]!);
      const engine = anova.find((x) => x.source === names[r.term])!;
      expect(nums[0]).toBe(r.df);
      expect(rel(nums[1]!, r.ss)).toBeLessThan(1e-5);
      expect(rel(nums[1]!, engine.ss)).toBeLessThan(1e-5);
      expect(rel(nums[2]!, r.ms)).toBeLessThan(1e-5);
      if (r.f !== null) {
        const e = engine as AnovaEffectRow;
        expect(rel(nums[3]!, r.f)).toBeLessThan(1e-5);
        expect(rel(nums[3]!, e.f)).toBeLessThan(1e-5);
        // p to 3 significant digits: at most half a unit in the 3rd digit (< 5e-3 relative)
        expect(rel(nums[4]!, r.p!)).toBeLessThan(5e-3);
        const pe = ref.twoWay.partialEtaSquared.find((x) => x.term === r.term)!.value;
        expect(rel(nums[5]!, pe)).toBeLessThan(1e-5);
      }
    }
    expect(pdf.text).toContain('do not replace qualified engineering judgement');
    expect(pdf.text).toContain('used in this analysis 54');
    expect(pdf.text).toMatch(/Data hash \(SHA-256\): [0-9a-f]{64}/);
  });

  it('members only', async () => {
    expect((await pdfText(outsider, aid)).status).toBe(404);
  });

  it('an approved report carries reviewer, approval date and hash, without the DRAFT banner; later edits mark it stale', async () => {
    expect((await engineer.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [userId(t.ctx, DEMO_EMAIL.supervisor)] })).status).toBe(201);
    const approved = await supervisor.post(`/api/analyses/${aid}/approve`, {});
    expect(approved.status).toBe(200);
    const pdf = await pdfText(engineer, aid);
    expect(pdf.text).not.toContain('DRAFT —');
    expect(pdf.text).toMatch(/Approved \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC by Priya Supervisor\./);
    expect(pdf.text).toContain('Review requested from Priya Supervisor (supervisor)');
    expect(pdf.text.replace(/\s+/g, '')).toContain(approved.body.analysis.dataHash);
    const sheet = await engineer.get(`/api/studies/${studyId}/runs`);
    const run = sheet.body.runs.find((r: { id: number }) => r.id === runIds[5]);
    expect((await engineer.patch(`/api/studies/${studyId}/runs/${runIds[5]}`, { version: run.version, values: { breaks: '53' } })).status).toBe(200);
    const stale = await pdfText(engineer, aid);
    expect(stale.text).toContain('STALE');
    expect(stale.text).toContain("Hash of today's data");
  });
});

describe('GET /api/analyses/:id/report.html', () => {
  it('is a self-contained printable page with every chart as inline SVG', async () => {
    const res = await engineer.get(`/api/analyses/${aid}/report.html`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toContain('text/html');
    const html = res.text;
    for (const id of ['main-effects:W', 'main-effects:T', 'interaction:W:T', 'interaction:T:W', 'box:W', 'box:T', 'residuals', 'qq', 'dispersion']) {
      expect(html).toContain(`id="chart-${id}"`);
    }
    expect(html.match(/<svg /g)?.length).toBe(9);
    expect(html).not.toMatch(/<script/i);
    expect(html).toContain('Warp breaks &lt;b&gt;as&lt;/b&gt; a study');
    expect(html).toContain('partial η²');
    // R 4.2.2: wool:tension F = 4.18906896685103 → 4.18907 at 6 significant digits (warpbreaks.json)
    expect(html).toMatch(/<th scope="row">W:T \*<\/th><td>2<\/td><td>1002.78<\/td><td>501.389<\/td><td>4.18907<\/td>/);
    expect(html).toContain('STALE');
  });
});
