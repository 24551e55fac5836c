import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { FACTORS, makeStudy, RESPONSES } from './study-fixtures.js';

// The set-up rules checked here are the product's own (docs/api-studies.md): common practice, no source.

let t: TestApp;
let engineer: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

async function emptyStudy(): Promise<number> {
  return (await engineer.post('/api/studies', { title: 'Set-up study' })).body.study.id;
}

describe('PUT factors', () => {
  it('stores factors in order and audits them', async () => {
    const id = await emptyStudy();
    const res = await engineer.put(`/api/studies/${id}/factors`, FACTORS);
    expect(res.status).toBe(200);
    expect(res.body.factors.map((f: { symbol: string; position: number }) => [f.symbol, f.position])).toEqual([['A', 0], ['B', 1]]);
    expect(res.body.factors[0].levels).toEqual([{ value: '0.5' }, { value: '0.8' }]);
    const audit = (await engineer.get(`/api/studies/${id}/audit?entity=factor`)).body;
    expect(audit.total).toBe(2);
  });

  it('names the offending field', async () => {
    const id = await emptyStudy();
    const res = await engineer.put(`/api/studies/${id}/factors`, {
      factors: [{ name: 'w', symbol: 'w', kind: 'numeric', levels: [{ value: '1,5' }, { value: '2' }, { value: '2' }] }, { name: 'x', symbol: 'W', kind: 'categorical', levels: [{ value: 'a' }] }],
    });
    expect(res.status).toBe(400);
    const paths = res.body.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['factors.0.levels.0.value', 'factors.0.levels.2.value', 'factors.1.levels', 'factors.1.symbol']));
    expect(res.body.message).toMatch(/Level "1,5" of a numeric factor must be a number/);
    expect(res.body.message).toMatch(/Symbol "W" is used twice/);
  });

  it('fixes the design once runs exist, but allows descriptive changes', async () => {
    const { id } = makeStudy(t);
    const current = (await engineer.get(`/api/studies/${id}`)).body.study.factors;
    const renamed = current.map((f: Record<string, unknown>) => ({ id: f.id, name: `${f.name} (renamed)`, symbol: f.symbol, unit: 'mm', kind: f.kind, levels: f.levels, tracksMeasured: f.tracksMeasured }));
    expect((await engineer.put(`/api/studies/${id}/factors`, { factors: renamed })).status).toBe(200);
    const changed = renamed.map((f: { levels: { value: string }[] }, i: number) => (i === 0 ? { ...f, levels: [...f.levels, { value: '1.1' }] } : f));
    const res = await engineer.put(`/api/studies/${id}/factors`, { factors: changed });
    expect(res.status).toBe(409);
    expect(res.body.message).toMatch(/factors, their symbols, kinds and level values are fixed now/);
    expect((await engineer.put(`/api/studies/${id}/factors`, { factors: renamed.slice(0, 1) })).status).toBe(409);
  });

  it('refuses another study\'s factor id and viewers', async () => {
    const a = makeStudy(t);
    const b = await emptyStudy();
    const foreign = (await engineer.get(`/api/studies/${a.id}`)).body.study.factors[0];
    const res = await engineer.put(`/api/studies/${b}/factors`, { factors: [{ ...FACTORS.factors[0], id: foreign.id }] });
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(new RegExp(`factor ${foreign.id} does not belong to this study`));
    expect((await supervisor.put(`/api/studies/${a.id}/factors`, FACTORS)).status).toBe(403);
  });
});

describe('PUT responses', () => {
  it('stores responses and validates goal and range', async () => {
    const id = await emptyStudy();
    expect((await engineer.put(`/api/studies/${id}/responses`, RESPONSES)).status).toBe(200);
    const bad = await engineer.put(`/api/studies/${id}/responses`, {
      responses: [{ name: 'r', symbol: 'r', goal: 'nominal', target: null, rangeMin: 3, rangeMax: 1 }, { name: 'q', symbol: 'q', goal: 'best' }],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['responses.0.target', 'responses.0.rangeMax', 'responses.1.goal']));
  });

  it('refuses to delete a response that has values', async () => {
    const { id, runIds } = makeStudy(t);
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, values: { ang: '31.5' } });
    const current = (await engineer.get(`/api/studies/${id}`)).body.study.responses;
    const res = await engineer.put(`/api/studies/${id}/responses`, { responses: [current[0]] });
    expect(res.status).toBe(409);
    expect(res.body.message).toBe('Response "ang" has 1 recorded values and cannot be deleted; keep it (values are never deleted silently)');
    const widened = current.map((r: Record<string, unknown>) => ({ ...r, rangeMax: r.symbol === 'H' ? 3 : r.rangeMax }));
    const ok = await engineer.put(`/api/studies/${id}/responses`, { responses: widened });
    expect(ok.status).toBe(200);
    expect(ok.body.responses[0].rangeMax).toBe(3);
  });
});

describe('outcomes', () => {
  it('lists the defaults and can be edited', async () => {
    const { id, runIds } = makeStudy(t);
    const list = (await supervisor.get(`/api/studies/${id}/outcomes`)).body.outcomes;
    expect(list).toHaveLength(6);
    const edited = [...list.map((o: Record<string, unknown>) => ({ id: o.id, label: o.label, valid: o.valid })), { label: 'grip slip', valid: false }];
    const res = await engineer.put(`/api/studies/${id}/outcomes`, { outcomes: edited });
    expect(res.status).toBe(200);
    expect(res.body.outcomes.at(-1)).toMatchObject({ label: 'grip slip', valid: false, position: 6 });
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: 1, outcomeId: list[1].id, outcomeReason: 'cracked at the notch root' });
    const drop = await engineer.put(`/api/studies/${id}/outcomes`, { outcomes: edited.filter((o: { id?: number }) => o.id !== list[1].id) });
    expect(drop.status).toBe(409);
    expect(drop.body.message).toMatch(/"brittle fracture" is recorded on 1 runs/);
    const none = await engineer.put(`/api/studies/${id}/outcomes`, { outcomes: [{ label: 'bad', valid: false }] });
    expect(none.status).toBe(400);
    expect(none.body.message).toMatch(/At least one outcome must be valid/);
    expect((await supervisor.put(`/api/studies/${id}/outcomes`, { outcomes: edited })).status).toBe(403);
  });
});
