import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { studies } from '../../server/db/schema.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';
import { makeStudy, userId } from './study-fixtures.js';

// Expected values here are the product's own rules (docs/api-studies.md), not measurements:
// common practice, no source.

let t: TestApp;
let engineer: Client;
let statistician: Client;
let supervisor: Client;
let admin: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  statistician = await signIn(t.app, 'statistician');
  supervisor = await signIn(t.app, 'supervisor');
  admin = await signIn(t.app, 'admin');
});
afterAll(() => t.close());

const setStatus = (id: number, status: (typeof studies.$inferSelect)['status']) => t.ctx.db.update(studies).set({ status }).where(eq(studies.id, id)).run();

describe('study CRUD', () => {
  it('an engineer creates a study and owns it, with the default outcomes and an audit row', async () => {
    const res = await engineer.post('/api/studies', { title: 'Strip study', materialGrade: 'X-1', thicknessMm: 1.2, orientationDeg: 90, batch: 'C-7' });
    expect(res.status).toBe(201);
    const s = res.body.study;
    expect(s).toMatchObject({ title: 'Strip study', status: 'draft', materialGrade: 'X-1', thicknessMm: 1.2, orientationDeg: 90, myRole: 'owner' });
    expect(s.outcomes.map((o: { label: string }) => o.label)).toEqual(['valid', 'brittle fracture', 'diffuse neck', 'no neck', 'fracture outside the gauge region', 'measurement lost']);
    expect(s.outcomes.filter((o: { valid: boolean }) => o.valid)).toHaveLength(1);
    expect(s.members).toEqual([expect.objectContaining({ userId: userId(t, 'engineer'), role: 'owner' })]);
    const audit = await engineer.get(`/api/studies/${s.id}/audit?entity=study&action=create`);
    expect(audit.body.total).toBe(1);
  });

  it('refuses bad fields with messages that name them', async () => {
    const res = await engineer.post('/api/studies', { title: '', thicknessMm: -1 });
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/title: Enter a title/);
    expect(res.body.message).toMatch(/thicknessMm: Sheet thickness \(mm\) must be at least 0.01/);
    expect(res.body.details.map((d: { path: string }) => d.path).sort()).toEqual(['thicknessMm', 'title']);
  });

  it('statisticians and supervisors cannot create studies', async () => {
    expect((await statistician.post('/api/studies', { title: 'x' })).status).toBe(403);
    expect((await supervisor.post('/api/studies', { title: 'x' })).status).toBe(403);
  });

  it('an admin creates a study for an engineer only', async () => {
    expect((await admin.post('/api/studies', { title: 'x' })).body.message).toMatch(/send ownerId/);
    const bad = await admin.post('/api/studies', { title: 'x', ownerId: userId(t, 'statistician') });
    expect(bad.status).toBe(400);
    expect(bad.body.message).toMatch(/must be an engineer/);
    const ok = await admin.post('/api/studies', { title: 'Admin-made', ownerId: userId(t, 'engineer') });
    expect(ok.status).toBe(201);
    expect(ok.body.study.owner.id).toBe(userId(t, 'engineer'));
  });

  it('non-members get 404, admins see every study', async () => {
    const { id } = makeStudy(t, { members: false });
    expect((await supervisor.get(`/api/studies/${id}`)).status).toBe(404);
    expect((await supervisor.get(`/api/studies/${id}/runs`)).status).toBe(404);
    const asAdmin = await admin.get(`/api/studies/${id}`);
    expect(asAdmin.status).toBe(200);
    expect(asAdmin.body.study.myRole).toBe('admin');
  });

  it('PATCH changes fields with audit, refuses viewers and stale versions', async () => {
    const { id } = makeStudy(t);
    const before = (await engineer.get(`/api/studies/${id}`)).body.study;
    const res = await engineer.patch(`/api/studies/${id}`, { batch: 'coil 42', version: before.version });
    expect(res.status).toBe(200);
    expect(res.body.study.batch).toBe('coil 42');
    const stale = await engineer.patch(`/api/studies/${id}`, { batch: 'coil 43', version: before.version });
    expect(stale.status).toBe(409);
    expect(stale.body.current.batch).toBe('coil 42');
    expect((await supervisor.patch(`/api/studies/${id}`, { batch: 'x' })).status).toBe(403);
    expect((await statistician.patch(`/api/studies/${id}`, { batch: 'x' })).status).toBe(403);
    const audit = await engineer.get(`/api/studies/${id}/audit?field=batch`);
    expect(audit.body.events[0]).toMatchObject({ oldValue: '', newValue: 'coil 42', user: { name: 'Elin Engineer' } });
  });
});

describe('status transitions', () => {
  it('follows the workflow and refuses shortcuts with a message', async () => {
    const { id } = makeStudy(t);
    const toPlanned = await engineer.patch(`/api/studies/${id}`, { status: 'planned' });
    expect(toPlanned.status).toBe(409);
    expect(toPlanned.body.message).toMatch(/committing a plan/);
    setStatus(id, 'planned');
    expect((await engineer.get(`/api/studies/${id}`)).body.study.allowedTransitions).toEqual(['draft', 'collecting']);
    expect((await engineer.patch(`/api/studies/${id}`, { status: 'collecting' })).status).toBe(200);
    const skip = await engineer.patch(`/api/studies/${id}`, { status: 'in_review' });
    expect(skip.status).toBe(409);
    expect(skip.body.message).toBe('A study cannot go from "collecting" to "in_review"; from "collecting" it can go to "planned" or "analysed"');
    expect((await engineer.patch(`/api/studies/${id}`, { status: 'analysed' })).status).toBe(200);
    const back = await engineer.patch(`/api/studies/${id}`, { status: 'collecting' });
    expect(back.status).toBe(400);
    expect(back.body.message).toMatch(/needs a reason/);
    expect((await engineer.patch(`/api/studies/${id}`, { status: 'collecting', reason: 'two more replicates' })).status).toBe(200);
    expect((await engineer.patch(`/api/studies/${id}`, { status: 'approved' })).body.message).toMatch(/signs off an analysis/);
    const audit = await engineer.get(`/api/studies/${id}/audit?action=status`);
    expect(audit.body.events.map((e: { newValue: string }) => e.newValue)).toEqual(['collecting', 'analysed', 'collecting']);
    expect(audit.body.events[0].reason).toBe('two more replicates');
  });

  it('planned -> draft is refused once runs hold results', async () => {
    const { id, runIds } = makeStudy(t);
    setStatus(id, 'planned');
    const run = (await engineer.get(`/api/studies/${id}/runs`)).body.runs[0];
    await engineer.patch(`/api/studies/${id}/runs/${runIds[0]}`, { version: run.version, notes: 'first specimen' });
    const res = await engineer.patch(`/api/studies/${id}`, { status: 'draft', reason: 'redo set-up' });
    expect(res.status).toBe(409);
    expect(res.body.message).toMatch(/1 runs already hold results/);
  });
});

describe('studies list', () => {
  it('shows members their studies with progress, filters, searches and sorts', async () => {
    const a = makeStudy(t, { title: 'Alpha grooves' });
    const b = makeStudy(t, { title: 'Beta notches', members: false });
    setStatus(b.id, 'collecting');
    const runs = (await engineer.get(`/api/studies/${a.id}/runs`)).body;
    const invalid = runs.outcomes.find((o: { valid: boolean }) => !o.valid).id;
    await engineer.post(`/api/studies/${a.id}/runs/batch`, {
      edits: [
        { runId: a.runIds[0], version: 1, values: { H: '0.5' } },
        { runId: a.runIds[1], version: 1, values: { H: '0.6' }, outcomeId: invalid },
      ],
    });
    const mine = (await engineer.get('/api/studies?q=alpha')).body.studies;
    expect(mine).toHaveLength(1);
    // 12 fixture runs (2 x 3 x 2 replicates), 2 recorded, 1 with an invalid outcome
    expect(mine[0].progress).toEqual({ planned: 12, recorded: 2, invalid: 1, removed: 0 });
    const viewerList = (await supervisor.get('/api/studies')).body.studies.map((s: { id: number }) => s.id);
    expect(viewerList).toContain(a.id);
    expect(viewerList).not.toContain(b.id);
    const collecting = (await engineer.get('/api/studies?status=collecting')).body.studies;
    expect(collecting.every((s: { status: string }) => s.status === 'collecting')).toBe(true);
    expect(collecting.map((s: { id: number }) => s.id)).toContain(b.id);
    const titles = (await engineer.get('/api/studies?sort=title')).body.studies.map((s: { title: string }) => s.title);
    expect(titles).toEqual([...titles].sort((x: string, y: string) => x.localeCompare(y, 'en', { sensitivity: 'base' })));
    expect((await engineer.get(`/api/studies?ownerId=${userId(t, 'statistician')}`)).body.studies).toEqual([]);
    expect((await engineer.get('/api/studies?status=done')).status).toBe(400);
    expect((await engineer.get('/api/studies?q=100%25')).body.studies).toEqual([]);
  });
});

describe('membership', () => {
  it('enforces which account roles may hold which study role', async () => {
    const { id } = makeStudy(t, { members: false });
    const r1 = await engineer.post(`/api/studies/${id}/members`, { userId: userId(t, 'statistician'), role: 'contributor' });
    expect(r1.status).toBe(400);
    expect(r1.body.message).toMatch(/a study contributor must be engineer/);
    const r2 = await engineer.post(`/api/studies/${id}/members`, { email: 'engineer@specimetry.test', role: 'reviewer' });
    expect(r2.status).toBe(400);
    expect((await engineer.post(`/api/studies/${id}/members`, { userId: userId(t, 'supervisor'), role: 'reviewer' })).status).toBe(201);
    const r3 = await engineer.post(`/api/studies/${id}/members`, { email: 'statistician@specimetry.test', role: 'viewer' });
    expect(r3.status).toBe(201);
    expect(r3.body.members.map((m: { role: string }) => m.role).sort()).toEqual(['owner', 'reviewer', 'viewer']);
    expect((await engineer.post(`/api/studies/${id}/members`, { userId: 99999, role: 'viewer' })).status).toBe(400);
    expect((await engineer.post(`/api/studies/${id}/members`, { role: 'viewer' })).status).toBe(400);
    expect((await supervisor.post(`/api/studies/${id}/members`, { userId: userId(t, 'statistician'), role: 'reviewer' })).status).toBe(403);
    const candidates = (await engineer.get(`/api/studies/${id}/member-candidates`)).body.users;
    expect(candidates).toEqual([]);
  });

  it('keeps exactly one owner; removing a member is audited', async () => {
    const { id } = makeStudy(t);
    const removeOwner = await engineer.delete(`/api/studies/${id}/members?userId=${userId(t, 'engineer')}`);
    expect(removeOwner.status).toBe(400);
    expect(removeOwner.body.message).toMatch(/make another engineer owner first/);
    const gone = await engineer.delete(`/api/studies/${id}/members?userId=${userId(t, 'supervisor')}`);
    expect(gone.status).toBe(200);
    expect(gone.body.members).toHaveLength(2);
    expect((await supervisor.get(`/api/studies/${id}`)).status).toBe(404);
    expect((await engineer.delete(`/api/studies/${id}/members?userId=abc`)).status).toBe(400);
    const audit = (await engineer.get(`/api/studies/${id}/audit?entity=member&action=remove`)).body.events;
    expect(audit[0]).toMatchObject({ oldValue: 'viewer', entityId: String(userId(t, 'supervisor')) });
  });
});
