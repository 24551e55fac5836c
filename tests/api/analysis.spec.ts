import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AnalysisDetail, AnovaEffectRow, PreviewResponse } from '../../shared/analysis.js';
import { createUser } from '../../server/services/users.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { DEMO_EMAIL, signIn, startTestApp, type Client, type TestApp } from './harness.js';
import { insertStudy, rel, warpbreaks, warpbreaksStudy } from './analysis-fixtures.js';

// Preview, save, list, view and the stale check, on R's warpbreaks data entered as a study.

let t: TestApp;
let engineer: Client;
let viewer: Client;
let outsider: Client;
let studyId: number;
let runIds: number[];
const ref = warpbreaks();
const spec = { response: 'breaks', factors: ['W', 'T'], terms: ['W', 'T', 'W:T'] };

beforeAll(async () => {
  t = await startTestApp();
  await createUser(t.ctx, { email: 'viewer@specimetry.test', name: 'Vic Viewer', role: 'engineer', password: DEMO_PASSWORD });
  await createUser(t.ctx, { email: 'outsider@specimetry.test', name: 'Oli Outsider', role: 'engineer', password: DEMO_PASSWORD });
  const s = warpbreaksStudy([{ email: 'viewer@specimetry.test', role: 'viewer' }]);
  // Runs that must not enter the analysis: two invalid specimens, one without a value, one removed.
  s.runs.push(
    { settings: { W: 'A', T: 'L' }, values: { breaks: '99' }, outcome: 'brittle fracture' },
    { settings: { W: 'B', T: 'H' }, values: { breaks: '1' }, outcome: 'diffuse neck' },
    { settings: { W: 'B', T: 'M' }, values: {} },
    { settings: { W: 'A', T: 'M' }, values: { breaks: '500' }, removed: true },
  );
  ({ studyId, runIds } = insertStudy(t.ctx, s));
  engineer = await signIn(t.app, 'engineer');
  viewer = await signIn(t.app, { email: 'viewer@specimetry.test', password: DEMO_PASSWORD });
  outsider = await signIn(t.app, { email: 'outsider@specimetry.test', password: DEMO_PASSWORD });
});
afterAll(() => t.close());

function effect(anova: PreviewResponse['result']['anova'], source: string): AnovaEffectRow {
  return anova.find((r) => r.source === source) as AnovaEffectRow;
}

describe('POST /api/studies/:id/analyses/preview', () => {
  it('reproduces R\'s two-way ANOVA of warpbreaks', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses/preview`, spec);
    expect(res.status).toBe(200);
    const body = res.body as PreviewResponse;
    // R 4.2.2 summary(aov(breaks ~ wool * tension, data = warpbreaks)) (shared/reference/r-datasets/warpbreaks.json)
    const terms: Record<string, string> = { wool: 'W', tension: 'T', 'wool:tension': 'W:T' };
    for (const r of ref.twoWay.table) {
      if (r.term === 'Residuals') {
        const resid = body.result.anova.find((x) => x.source === 'Residual')!;
        expect(resid.df).toBe(r.df);
        expect(rel(resid.ss, r.ss)).toBeLessThan(1e-9);
        continue;
      }
      const row = effect(body.result.anova, terms[r.term]!);
      expect(row.df).toBe(r.df);
      expect(rel(row.ss, r.ss)).toBeLessThan(1e-9);
      expect(rel(row.ms, r.ms)).toBeLessThan(1e-9);
      expect(rel(row.f, r.f!)).toBeLessThan(1e-9);
      expect(rel(row.p, r.p!)).toBeLessThan(1e-7);
    }
    // R 4.2.2 partial eta-squared SS/(SS + SS_res) (shared/reference/r-datasets/warpbreaks.json)
    for (const pe of ref.twoWay.partialEtaSquared) expect(rel(effect(body.result.anova, terms[pe.term]!).partialEtaSq, pe.value)).toBeLessThan(1e-9);
    // R 4.2.2 shapiro.test(residuals(aov(breaks ~ wool * tension))) (warpbreaks.json)
    expect(rel(body.result.tests.shapiro!.w, ref.shapiroResidualsTwoWay.W)).toBeLessThan(1e-6);
    // R 4.2.2 Levene over the 6 cells, anova(lm(|breaks - cell mean| ~ g)) (warpbreaks.json)
    expect(rel(body.result.tests.levene!.f, ref.leveneMeanCells.f)).toBeLessThan(1e-9);
  });

  it('compares levels of the significant terms as R\'s TukeyHSD on the two-way model does', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses/preview`, spec);
    const posthoc = (res.body as PreviewResponse).posthoc;
    // wool is not significant at 0.05 (R: p = 0.0582), tension and wool:tension are (warpbreaks.json)
    expect(posthoc.map((p) => p.term)).toEqual(['T', 'W:T']);
    // R 4.2.2 TukeyHSD(aov(breaks ~ wool * tension, data = warpbreaks)) (warpbreaks.json tukeyHSDTwoWay);
    // its intervals and adjusted p agree with SciPy to 4e-9 relative at df 48 (reference README), hence 1e-7.
    const refTerms = ref.tukeyHSDTwoWay.terms;
    for (const [term, rTerm] of [['T', 'tension'], ['W:T', 'wool:tension']] as const) {
      const ours = posthoc.find((p) => p.term === term)!.comparisons;
      const theirs = refTerms[rTerm]!;
      expect(ours.map((c) => `${c.b}-${c.a}`)).toEqual(theirs.map((c) => c.comparison));
      ours.forEach((c, i) => {
        const r = theirs[i]!;
        expect(rel(c.diff, r.diff)).toBeLessThan(1e-9);
        expect(rel(c.lower, r.lwr)).toBeLessThan(1e-7);
        expect(rel(c.upper, r.upr)).toBeLessThan(1e-7);
        expect(rel(c.p, r.pAdj)).toBeLessThan(1e-7);
      });
    }
    const quick = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, posthoc: false });
    expect(quick.body.posthoc).toEqual([]);
  });

  it('always returns the run counts: used, invalid by reason, missing value, removed', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses/preview`, spec);
    // 54 warpbreaks rows + the 4 extra fixture runs above
    expect(res.body.counts).toEqual({
      total: 58, used: 54, removed: 1, centrePoints: 0, excludedInvalid: 2,
      byReason: [{ outcome: 'brittle fracture', count: 1 }, { outcome: 'diffuse neck', count: 1 }],
      invalidIncluded: 0, missingValue: 1,
    });
    expect(res.body.rowCodes).toHaveLength(54);
    expect(res.body.result.residuals).toHaveLength(54);
  });

  it('includes invalid runs on request and says so', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, excludeInvalid: false });
    expect(res.status).toBe(200);
    expect(res.body.counts.used).toBe(56);
    expect(res.body.counts.invalidIncluded).toBe(2);
    expect(res.body.counts.excludedInvalid).toBe(0);
    // 54 + the 2 invalid runs: the residual df of R's table (48) grows by 2
    expect(res.body.result.anova.find((r: { source: string }) => r.source === 'Residual').df).toBe(50);
  });

  it('writes a summary with the numbers and a reading per panel', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses/preview`, spec);
    const { summary, readings } = res.body as PreviewResponse;
    // R 4.2.2: tension F = 8.498, p = 0.000693; wool:tension F = 4.189, p = 0.021 (warpbreaks.json)
    expect(summary).toContain('T (F(2, 48) = 8.498, p = 6.93e-4');
    expect(summary).toContain('W:T (F(2, 48) = 4.189, p = 0.021');
    expect(summary).toMatch(/partial η² = 0\.261/); // R: 0.261494 (warpbreaks.json)
    expect(summary).toContain('do not replace qualified engineering judgement');
    expect(summary).toContain('54 of 58 runs used');
    // Levene over the cells: R gives p = 0.000735 (< 0.05), so the reading must point at the alternatives.
    expect(readings.assumptions).toContain('Welch');
    expect(readings.assumptions).toContain('Kruskal–Wallis');
    expect(Object.keys(readings).sort()).toEqual(['anova', 'assumptions', 'descriptives', 'dispersion', 'notes', 'posthoc']);
  });

  it('runs the dispersion analysis: cell SDs as R gives them, settings ranked by scatter', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, posthoc: false });
    const d = (res.body as PreviewResponse).result.dispersion!;
    // R 4.2.2 sd(breaks) per wool:tension cell (warpbreaks.json cellSummary)
    for (const c of ref.cellSummary) {
      const [w, tn] = c.level.split(':');
      expect(rel(d.cells.find((x) => x.key['W'] === w && x.key['T'] === tn)!.sd!, c.sd)).toBeLessThan(1e-9);
    }
    // The fixture response has no target, so the ranking is by s² alone: smallest R cell SD is B:H (4.89).
    expect(d.ranking[0]!.key).toEqual({ W: 'B', T: 'H' });
    expect(res.body.result.notes.join(' ')).toContain('has no target');
    expect(res.body.readings.dispersion).toContain('1. W=B, T=H');
  });

  it('defaults to main effects plus two-factor interactions and Type II; adds the Type III caveat', async () => {
    const def = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { response: 'breaks', factors: ['W', 'T'] });
    expect(def.body.result.terms).toEqual(['W', 'T', 'W:T']);
    expect(def.body.result.ssType).toBe(2);
    const t3 = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, ssType: 3 });
    expect(t3.body.result.notes.join(' ')).toContain('Type III sums of squares were requested');
  });

  it('refuses bad input with a message naming the value', async () => {
    const a = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, response: 'Hx' });
    expect(a.status).toBe(400);
    expect(a.body.message).toContain('"Hx"');
    const b = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, terms: ['W', 'W:Q'] });
    expect(b.status).toBe(400);
    expect(b.body.message).toContain('W:Q');
    const c = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, ssType: 4 });
    expect(c.status).toBe(400);
    expect(c.body.message).toContain('ssType');
    const d = await engineer.post(`/api/studies/${studyId}/analyses/preview`, { ...spec, factors: ['Z'], terms: undefined });
    expect(d.status).toBe(400);
    expect(d.body.message).toContain('"Z"');
  });

  it('is open to viewers and hidden from non-members', async () => {
    expect((await viewer.post(`/api/studies/${studyId}/analyses/preview`, spec)).status).toBe(200);
    expect((await outsider.post(`/api/studies/${studyId}/analyses/preview`, spec)).status).toBe(404);
  });
});

describe('saved analyses and the data hash', () => {
  let saved: AnalysisDetail;

  it('saves spec, result, engine version and the SHA-256 of the canonical data', async () => {
    const res = await engineer.post(`/api/studies/${studyId}/analyses`, { ...spec, title: 'breaks by wool and tension' });
    expect(res.status).toBe(201);
    saved = res.body.analysis;
    expect(saved.status).toBe('draft');
    expect(saved.stale).toBe(false);
    expect(saved.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(saved.spec).toMatchObject({ ...spec, ssType: 2, alpha: 0.05, excludeInvalid: true });
    // Re-build the canonical JSON by hand from the documented form (docs/api-analysis.md): keys in
    // code-unit order, no whitespace, rows = used runs by run id, values exactly as entered.
    const rows = ref.rows.map(([b, w, tn], i) => `{"code":"R${String(i + 1).padStart(4, '0')}","outcome":"valid","runId":${runIds[i]},"settings":{"T":"${tn}","W":"${w}"},"value":"${b}"}`);
    const doc = `{"factors":["W","T"],"format":"specimetry.analysis-data.v1","response":"breaks","rows":[${rows.join(',')}],"studyId":${studyId}}`;
    expect(saved.dataHash).toBe(createHash('sha256').update(doc, 'utf8').digest('hex'));
  });

  it('moves the study from collecting to analysed, and audits the save', async () => {
    const study = await engineer.get(`/api/studies/${studyId}`);
    expect(study.body.study.status).toBe('analysed');
    const audit = t.ctx.db.$client.prepare("select action from audit_events where entity = 'analysis' and entity_id = ?").all(String(saved.id)) as { action: string }[];
    expect(audit.map((a) => a.action)).toContain('create');
  });

  it('lists the study\'s analyses with a stale flag', async () => {
    const res = await viewer.get(`/api/studies/${studyId}/analyses`);
    expect(res.status).toBe(200);
    expect(res.body.analyses.map((a: { id: number; stale: boolean }) => [a.id, a.stale])).toEqual([[saved.id, false]]);
  });

  it('viewers cannot save; non-members do not see the analysis', async () => {
    expect((await viewer.post(`/api/studies/${studyId}/analyses`, spec)).status).toBe(403);
    expect((await outsider.get(`/api/analyses/${saved.id}`)).status).toBe(404);
    expect((await engineer.get('/api/analyses/99999')).status).toBe(404);
  });

  it('turns stale when a used run is edited, and says what changed (old → new)', async () => {
    const sheet = await engineer.get(`/api/studies/${studyId}/runs`);
    const run = sheet.body.runs.find((r: { id: number }) => r.id === runIds[0]);
    const patch = await engineer.patch(`/api/studies/${studyId}/runs/${runIds[0]}`, { version: run.version, values: { breaks: '27' } });
    expect(patch.status).toBe(200);
    const res = await engineer.get(`/api/analyses/${saved.id}`);
    expect(res.body.analysis.stale).toBe(true);
    expect(res.body.analysis.currentHash).not.toBe(saved.dataHash);
    // warpbreaks row 1 is breaks = 26 (R datasets, warpbreaks.json)
    expect(res.body.analysis.changes.edited).toEqual([{ runId: runIds[0], code: 'R0001', field: 'value', oldValue: '26', newValue: '27' }]);
    const list = await engineer.get(`/api/studies/${studyId}/analyses`);
    expect(list.body.analyses[0].stale).toBe(true);
  });

  it('reports removed runs and runs newly in the selection', async () => {
    const sheet = await engineer.get(`/api/studies/${studyId}/runs`);
    const second = sheet.body.runs.find((r: { id: number }) => r.id === runIds[1]);
    expect((await engineer.delete(`/api/studies/${studyId}/runs/${runIds[1]}`, { reason: 'specimen mix-up', version: second.version })).status).toBe(200);
    const missing = sheet.body.runs.find((r: { id: number }) => r.id === runIds[56]);
    expect((await engineer.patch(`/api/studies/${studyId}/runs/${runIds[56]}`, { version: missing.version, values: { breaks: '30' } })).status).toBe(200);
    const res = await engineer.get(`/api/analyses/${saved.id}`);
    expect(res.body.analysis.changes.removed).toEqual([{ runId: runIds[1], code: 'R0002', value: '30', why: 'run removed' }]);
    expect(res.body.analysis.changes.added).toEqual([{ runId: runIds[56], code: 'R0057', value: '30' }]);
  });
});
