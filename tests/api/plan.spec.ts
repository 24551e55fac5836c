import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { FACTORS, RESPONSES } from './study-fixtures.js';

let t: TestApp;
let engineer: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

async function study(factors = FACTORS): Promise<number> {
  const id = (await engineer.post('/api/studies', { title: 'Plan study' })).body.study.id as number;
  expect((await engineer.put(`/api/studies/${id}/factors`, factors)).status).toBe(200);
  expect((await engineer.put(`/api/studies/${id}/responses`, RESPONSES)).status).toBe(200);
  await engineer.post(`/api/studies/${id}/members`, { email: 'supervisor@specimetry.test', role: 'viewer' });
  return id;
}

const twoLevel = (k: number) => ({
  factors: Array.from({ length: k }, (_, i) => ({ name: `f${i}`, symbol: `f${i}`, unit: '', kind: 'numeric' as const, levels: [{ value: '1.0' }, { value: '2.0' }], tracksMeasured: false })),
});

describe('plan preview and commit', () => {
  it('previews a replicated full factorial without writing, reproducibly for a seed', async () => {
    const id = await study();
    const body = { design: 'full', replicates: 2, seed: 42, power: { effect: { kind: 'cohenF', f: 0.4 }, alpha: 0.05, targetPower: 0.8 } };
    const res = await engineer.post(`/api/studies/${id}/plan/preview`, body);
    expect(res.status).toBe(200);
    const p = res.body.preview;
    // 2 x 3 levels x 2 replicates = 12 runs (arithmetic)
    expect(p.runCount).toBe(12);
    expect(p.runs).toHaveLength(12);
    expect(p.power.map((x: { term: string }) => x.term)).toEqual(['A', 'B', 'A:B']);
    expect(p.replicatesForTarget).toBeGreaterThan(2);
    const standard = [...p.runs].sort((a: { standardOrder: number }, b: { standardOrder: number }) => a.standardOrder - b.standardOrder);
    // Standard order: first factor changes fastest (Box, Hunter & Hunter 2005, ch. 5)
    expect(standard.slice(0, 3).map((r: { settings: object }) => r.settings)).toEqual([{ A: '0.5', B: 'round' }, { A: '0.8', B: 'round' }, { A: '0.5', B: 'vee' }]);
    const again = (await engineer.post(`/api/studies/${id}/plan/preview`, body)).body.preview;
    expect(again.runs.map((r: { standardOrder: number }) => r.standardOrder)).toEqual(p.runs.map((r: { standardOrder: number }) => r.standardOrder));
    expect((await engineer.get(`/api/studies/${id}/runs`)).body.runs).toEqual([]);
  });

  it('commits runs with codes, moves the study to planned and audits it', async () => {
    const id = await study();
    const res = await engineer.post(`/api/studies/${id}/plan`, { design: 'full', replicates: 2, blocks: 'perReplicate', seed: 7 });
    expect(res.status).toBe(201);
    expect(res.body.runCount).toBe(12);
    const sheet = (await supervisor.get(`/api/studies/${id}/runs`)).body;
    expect(sheet.runs.map((r: { code: string }) => r.code).slice(0, 3)).toEqual(['R001', 'R002', 'R003']);
    expect(new Set(sheet.runs.map((r: { block: string }) => r.block))).toEqual(new Set(['Block 1', 'Block 2']));
    const detail = (await engineer.get(`/api/studies/${id}`)).body.study;
    expect(detail.status).toBe('planned');
    expect(detail.plan.spec).toMatchObject({ design: 'full', replicates: 2, seed: 7 });
    expect((await engineer.get(`/api/studies/${id}/audit?entity=plan`)).body.events[0].action).toBe('create');
  });

  it('regenerates while no run has results, and refuses once one does', async () => {
    const id = await study();
    await engineer.post(`/api/studies/${id}/plan`, { design: 'full', replicates: 1, seed: 1 });
    const again = await engineer.post(`/api/studies/${id}/plan`, { design: 'full', replicates: 3, seed: 2 });
    expect(again.status).toBe(201);
    expect(again.body.runCount).toBe(18);
    const run = (await engineer.get(`/api/studies/${id}/runs`)).body.runs[4];
    await engineer.patch(`/api/studies/${id}/runs/${run.id}`, { version: run.version, values: { H: '0.47' } });
    const refused = await engineer.post(`/api/studies/${id}/plan`, { design: 'full', replicates: 2, seed: 3 });
    expect(refused.status).toBe(409);
    expect(refused.body.message).toMatch(/cannot be regenerated: 1 runs already hold results/);
    expect((await engineer.get(`/api/studies/${id}/runs`)).body.runs).toHaveLength(18);
  });

  it('builds a 2^(4-1) fraction with its defining relation, resolution and aliases', async () => {
    const id = await study(twoLevel(4));
    const res = await engineer.post(`/api/studies/${id}/plan/preview`, { design: 'fractional', replicates: 1, fraction: { p: 1 }, centrePoints: 2, seed: 5 });
    expect(res.status).toBe(200);
    const p = res.body.preview;
    // 2^(4-1) with D = ABC: I = ABCD, resolution IV (Box, Hunter & Hunter 2005, ch. 6); 8 runs + 2 centre points
    expect(p).toMatchObject({ runCount: 10, resolution: 4, definingRelation: 'I = ABCD', generators: ['D=ABC'] });
    expect(p.runs.filter((r: { centrePoint: boolean }) => r.centrePoint).map((r: { settings: object }) => r.settings)).toEqual([
      { f0: '1.5', f1: '1.5', f2: '1.5', f3: '1.5' },
      { f0: '1.5', f1: '1.5', f2: '1.5', f3: '1.5' },
    ]);
    expect(p.runs.find((r: { centrePoint: boolean }) => !r.centrePoint).settings.f0).toMatch(/^[12]\.0$/);
    expect(p.aliases.find((a: { effect: string }) => a.effect === 'AB').aliases).toEqual(['CD']);
  });

  it('refuses impossible plans with a message and viewers', async () => {
    const id = await study();
    const centre = await engineer.post(`/api/studies/${id}/plan/preview`, { design: 'full', replicates: 1, centrePoints: 2 });
    expect(centre.status).toBe(400);
    expect(centre.body.message).toMatch(/centre points are added to two-level fractional plans/);
    const frac = await engineer.post(`/api/studies/${id}/plan/preview`, { design: 'fractional', replicates: 1, fraction: { p: 1 } });
    expect(frac.body.message).toMatch(/Factor "B" has 3 levels/);
    const blocks = await engineer.post(`/api/studies/${id}/plan/preview`, { design: 'full', replicates: 3, blocks: 2 });
    expect(blocks.body.details[0]).toMatchObject({ path: 'blocks', message: '2 blocks do not divide 3 replicates' });
    expect((await engineer.post(`/api/studies/${id}/plan/preview`, { design: 'full' })).body.message).toMatch(/replicates/);
    expect((await supervisor.post(`/api/studies/${id}/plan`, { design: 'full', replicates: 1 })).status).toBe(403);
    const empty = (await engineer.post('/api/studies', { title: 'No factors' })).body.study.id;
    expect((await engineer.post(`/api/studies/${empty}/plan/preview`, { design: 'full', replicates: 1 })).body.message).toMatch(/no factors yet/);
  });
});
