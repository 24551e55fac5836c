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

  it('commits a 2^3 full factorial with centre points per block and shows them in the run sheet', async () => {
    const id = await study(twoLevel(3));
    const res = await engineer.post(`/api/studies/${id}/plan`, { design: 'full', replicates: 2, blocks: 'perReplicate', centrePoints: 3, seed: 21 });
    expect(res.status).toBe(201);
    // 2^3 x 2 replicates + 3 centre points in each of 2 blocks = 22 runs (Montgomery, Design and
    // Analysis of Experiments, §6.8, from memory); the centre of 1.0 and 2.0 is 1.5 (arithmetic)
    expect(res.body.runCount).toBe(22);
    const sheet = (await supervisor.get(`/api/studies/${id}/runs`)).body.runs as { code: string; block: string; centrePoint: boolean; standardOrder: number; runOrder: number; settings: Record<string, string> }[];
    expect(sheet).toHaveLength(22);
    const centres = sheet.filter((r) => r.centrePoint);
    expect(centres.map((r) => r.settings)).toEqual(Array(6).fill({ f0: '1.5', f1: '1.5', f2: '1.5' }));
    expect(centres.filter((r) => r.block === 'Block 1')).toHaveLength(3);
    expect(centres.filter((r) => r.block === 'Block 2')).toHaveLength(3);
    expect(centres.map((r) => r.standardOrder).sort((a, b) => a - b)).toEqual([17, 18, 19, 20, 21, 22]);
    expect(sheet.filter((r) => !r.centrePoint).every((r) => /^[12]\.0$/.test(r.settings.f0))).toBe(true);
    expect((await engineer.get(`/api/studies/${id}`)).body.study.plan.spec).toMatchObject({ design: 'full', centrePoints: 3 });
  });

  it('previews power for a fraction from its main effects and clear interactions', async () => {
    const id = await study(twoLevel(4));
    const body = { design: 'fractional', replicates: 2, fraction: { p: 1 }, seed: 5, power: { effect: { kind: 'cohenF', f: 0.5 }, alpha: 0.05, targetPower: 0.8 } };
    const p = (await engineer.post(`/api/studies/${id}/plan/preview`, body)).body.preview;
    // 2^(4-1), I = ABCD: 4 main effects + AB = CD, AC = BD, AD = BC; error 16 - 1 - 7 = 8 (BHH 2005, ch. 6)
    expect(p.power.map((t: { term: string; dfError: number }) => [t.term, t.dfError])).toEqual([['f0', 8], ['f1', 8], ['f2', 8], ['f3', 8], ['f0:f1', 8], ['f0:f2', 8], ['f0:f3', 8]]);
    expect(p.replicatesForTarget).toBeGreaterThan(2);
    expect(p.notes.join(' ')).toMatch(/clear of them \(f0:f1 = f2:f3/);
  });

  it('refuses impossible plans with a message and viewers', async () => {
    const id = await study();
    const centre = await engineer.post(`/api/studies/${id}/plan/preview`, { design: 'full', replicates: 1, centrePoints: 2 });
    expect(centre.status).toBe(400);
    expect(centre.body.message).toMatch(/centre points only when every factor is numeric with exactly two levels.*factor "B" is categorical/);
    expect(centre.body.details[0]).toMatchObject({ path: 'centrePoints' });
    const three = await study({ factors: [twoLevel(1).factors[0]!, { ...twoLevel(2).factors[1]!, levels: [{ value: '1' }, { value: '2' }, { value: '3' }] }] });
    const threeLevel = await engineer.post(`/api/studies/${three}/plan/preview`, { design: 'full', replicates: 2, centrePoints: 2 });
    expect(threeLevel.status).toBe(400);
    expect(threeLevel.body.message).toMatch(/factor "f1" has 3 levels; give its middle value as a level instead/);
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
