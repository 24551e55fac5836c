import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CALC_VERSION } from '../../server/calc/version.js';
import { runs } from '../../server/db/schema.js';
import { createStudy } from '../../server/services/studies.js';
import { upsertMember } from '../../server/services/study-members.js';
import { putFactors, putResponses } from '../../server/services/study-setup.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { actorFor, userId } from './study-fixtures.js';

/*
 * Derived response "estimated H" per run. Expected values:
 *  - θ = arctan √2 = 54.7356°, φ = 90° − θ = 35.2644° is the isotropic free neck (Hill 1952), so under
 *    normal anisotropy r = 1 and H = r/(1 + r) = 1/2 (Hill 1948 with G + H = 1);
 *  - for r = 2 at an imposed θ = 60° the angle comes from tan φ = tan θ (1 + 2r)/(tan²θ + 2 + 2r)
 *    (server/calc/NECK-THEORY.md §8, Hill 1952 kinematics with the Hill 1948 flow rule), and H = 2/3;
 *  - φ = 70° at θ = 60° thickens the band (φ ≥ θ): no admissible H.
 */
const PSI = (Math.atan(Math.SQRT2) * 180) / Math.PI;
const T60 = Math.tan(Math.PI / 3);
const PHI_R2 = (Math.atan((T60 * 5) / (T60 * T60 + 6)) * 180) / Math.PI;

let t: TestApp;
let engineer: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

function neckStudy(): { id: number; runIds: number[] } {
  const eng = actorFor(t, 'engineer');
  const id = createStudy(t.ctx.db, eng, { title: 'Neck angle study', purpose: '', specimenFamily: '', materialDescription: '', materialGrade: 'TEST-2', batch: '', thicknessMm: 1, orientationDeg: 0 });
  putFactors(t.ctx.db, eng, id, { factors: [{ name: 'Neck angle', symbol: 'theta', unit: 'deg', kind: 'numeric', levels: [{ value: String(PSI) }, { value: '60' }], tracksMeasured: true }] });
  putResponses(t.ctx.db, eng, id, { responses: [{ name: 'Relative-displacement angle', symbol: 'phi', unit: 'deg', decimals: 4, goal: 'scatter', target: null, rangeMin: null, rangeMax: null }] });
  upsertMember(t.ctx.db, eng, id, { userId: userId(t, 'supervisor'), role: 'viewer' });
  const settings = [String(PSI), String(PSI), '60', '60'];
  const runIds = t.ctx.db
    .insert(runs)
    .values(settings.map((theta, i) => ({ studyId: id, code: `N${i + 1}`, standardOrder: i + 1, runOrder: i + 1, block: '1', settings: { theta } })))
    .returning({ id: runs.id })
    .all()
    .map((r) => r.id);
  return { id, runIds };
}

const BODY = { angleResponse: 'phi', neckAngle: { kind: 'factor', symbol: 'theta' }, assumption: { kind: 'normal-anisotropy' } };

describe('derived H per run', () => {
  it('estimates H per run, stores it as a derived response with provenance, and gives runs without a solution a reason', async () => {
    await engineer.prime();
    const { id, runIds } = neckStudy();
    const [n1, n2, n3] = runIds as [number, number, number, number];
    // N2: nominal θ = 54.74°, but the measured (as-machined) θ = 60° must be the one used.
    const edits = [
      { runId: n1, version: 1, values: { phi: String(90 - PSI) } },
      { runId: n2, version: 1, values: { phi: String(PHI_R2) }, measured: { theta: '60' } },
      { runId: n3, version: 1, values: { phi: '70' } },
    ];
    expect((await engineer.post(`/api/studies/${id}/runs/batch`, { edits })).status).toBe(200);

    const preview = await supervisor.post(`/api/studies/${id}/calc/derived-h/preview`, BODY);
    expect(preview.status).toBe(200);
    const est = preview.body.result.estimates as { code: string; H: number | null; r: number | null; reason: string | null; neckAngleFrom: string }[];
    expect(est[0]!.H).toBeCloseTo(0.5, 10); // Hill 1952 isotropic free neck → r = 1 → H = 1/2
    expect(est[1]!.r).toBeCloseTo(2, 10); // NECK-THEORY §8 forward relation inverted
    expect(est[1]!.H).toBeCloseTo(2 / 3, 10);
    expect(est[1]!.neckAngleFrom).toBe('measured theta');
    expect(est[2]).toMatchObject({ H: null, reason: expect.stringMatching(/relativeDisplacementAngleDeg = 70° admits no positive r at θ = 60°/) });
    expect(est[3]).toMatchObject({ H: null, reason: 'no value of phi recorded for this run yet' });
    expect(preview.body.result.cautions.join(' ')).toMatch(/not standard tensile specimens/);

    expect((await supervisor.post(`/api/studies/${id}/calc/derived-h`, { ...BODY, target: { symbol: 'Hest' } })).status).toBe(403);
    const stored = await engineer.post(`/api/studies/${id}/calc/derived-h`, { ...BODY, target: { symbol: 'Hest', name: 'Estimated H' } });
    expect(stored.status).toBe(200);
    expect(stored.body.response.derivation).toMatchObject({ kind: 'hill-h-from-angle', calcVersion: CALC_VERSION, angleResponse: 'phi', withoutValue: [expect.objectContaining({ code: 'N3' }), expect.objectContaining({ code: 'N4' })] });

    const overview = (await supervisor.get(`/api/studies/${id}/calc`)).body;
    expect(overview.responses.find((r: { symbol: string }) => r.symbol === 'Hest').derivation.kind).toBe('hill-h-from-angle');
    const byCode = new Map(overview.runs.map((r: { code: string }) => [r.code, r])) as Map<string, { values: Record<string, { text: string; provenance: Record<string, unknown> }> }>;
    expect(Number(byCode.get('N1')!.values['Hest']!.text)).toBeCloseTo(0.5, 6);
    expect(byCode.get('N2')!.values['Hest']!.provenance).toMatchObject({ kind: 'hill-h-from-angle', neckAngleDeg: 60, neckAngleFrom: 'measured theta', assumption: { kind: 'normal-anisotropy' }, calcVersion: CALC_VERSION });
    expect(byCode.get('N3')!.values['Hest']).toBeUndefined();
    // The analysis reads the run sheet: the derived response is a response like any other there.
    const sheet = (await engineer.get(`/api/studies/${id}/runs`)).body;
    expect(sheet.responses.map((r: { symbol: string }) => r.symbol)).toEqual(['phi', 'Hest']);
    const audit = (await engineer.get(`/api/studies/${id}/audit?field=value:Hest`)).body.events;
    expect(audit).toHaveLength(2);
    expect(audit[0]).toMatchObject({ action: 'calc-derived' });
  });

  it('re-derives after an angle changes, clears values that lost their solution, and never overwrites a typed value', async () => {
    await engineer.prime();
    const { id, runIds } = neckStudy();
    const [n1, , n3, n4] = runIds as [number, number, number, number];
    await engineer.post(`/api/studies/${id}/runs/batch`, { edits: [{ runId: n1, version: 1, values: { phi: String(90 - PSI) } }, { runId: n3, version: 1, values: { phi: String(PHI_R2) } }] });
    const first = await engineer.post(`/api/studies/${id}/calc/derived-h`, { ...BODY, target: { symbol: 'Hest' } });
    expect(first.body.result.estimates.filter((e: { H: number | null }) => e.H !== null)).toHaveLength(2);
    // N1's angle is re-measured to an inadmissible one; N4 gets a value typed by hand.
    const sheet = (await engineer.get(`/api/studies/${id}/runs`)).body.runs as { id: number; version: number }[];
    const v = (rid: number) => sheet.find((r) => r.id === rid)!.version;
    await engineer.post(`/api/studies/${id}/runs/batch`, { edits: [{ runId: n1, version: v(n1), values: { phi: '80' } }, { runId: n4, version: v(n4), values: { Hest: '0.41' } }] });
    const second = await engineer.post(`/api/studies/${id}/calc/derived-h`, { ...BODY, target: { symbol: 'Hest' }, reason: 'N1 re-measured' });
    expect(second.status).toBe(200);
    expect(second.body.changes).toEqual([expect.objectContaining({ code: 'N1', field: 'value:Hest', newValue: null })]);
    const n4est = second.body.result.estimates.find((e: { code: string }) => e.code === 'N4');
    expect(n4est.reason).toMatch(/Hest = 0\.41 was entered by hand/);
    const values = (await engineer.get(`/api/studies/${id}/runs`)).body.runs.map((r: { code: string; values: Record<string, { text: string }> }) => [r.code, r.values['Hest']?.text ?? null]);
    expect(values[0]).toEqual(['N1', null]);
    expect(values[3]).toEqual(['N4', '0.41']);
  });

  it('refuses a measured response as target, a categorical neck-angle factor and inadmissible given coefficients', async () => {
    await engineer.prime();
    const { id } = neckStudy();
    const taken = await engineer.post(`/api/studies/${id}/calc/derived-h`, { ...BODY, target: { symbol: 'phi' } });
    expect(taken.status).toBe(409);
    expect(taken.body.message).toMatch(/Response "phi" holds measured values/);
    const unknown = await engineer.post(`/api/studies/${id}/calc/derived-h/preview`, { ...BODY, neckAngle: { kind: 'factor', symbol: 'w0' } });
    expect(unknown.body.message).toMatch(/no factor "w0"/);
    const badF = await engineer.post(`/api/studies/${id}/calc/derived-h/preview`, { ...BODY, assumption: { kind: 'given-FGN', F: -1, G: 0.5, N: 1.5 } });
    expect(badF.status).toBe(400);
    expect(badF.body.message).toMatch(/F = -1 is not admissible/);
  });
});
