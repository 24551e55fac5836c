import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser } from '../../server/services/users.js';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { DEMO_EMAIL, linkIn, signIn, startTestApp, waitForMail, type Client, type TestApp } from './harness.js';
import { insertStudy, userId, warpbreaksStudy } from './analysis-fixtures.js';

// Review requests (mail + in-app), comments, sign-off rules, returns, staleness after approval and
// the recommendation, on R's warpbreaks data entered as a study.

let t: TestApp;
const c: Record<'engineer' | 'statistician' | 'supervisor' | 'admin' | 'viewer', Client> = {} as never;
let studyId: number;
/** a second study for the return tests: the first one ends approved */
let study2: number;
let runIds: number[];
let ids: { statistician: number; supervisor: number; viewer: number; engineer: number };
const spec = { response: 'breaks', factors: ['W', 'T'], terms: ['W', 'T', 'W:T'] };

beforeAll(async () => {
  t = await startTestApp();
  await createUser(t.ctx, { email: 'viewer@specimetry.test', name: 'Vic Viewer', role: 'engineer', password: DEMO_PASSWORD });
  ({ studyId, runIds } = insertStudy(t.ctx, warpbreaksStudy([
    { email: DEMO_EMAIL.statistician, role: 'reviewer' },
    { email: DEMO_EMAIL.supervisor, role: 'reviewer' },
    { email: 'viewer@specimetry.test', role: 'viewer' },
  ])));
  study2 = insertStudy(t.ctx, { ...warpbreaksStudy([{ email: DEMO_EMAIL.supervisor, role: 'reviewer' }, { email: DEMO_EMAIL.statistician, role: 'reviewer' }]), status: 'analysed' }).studyId;
  for (const role of ['engineer', 'statistician', 'supervisor', 'admin'] as const) c[role] = await signIn(t.app, role);
  c.viewer = await signIn(t.app, { email: 'viewer@specimetry.test', password: DEMO_PASSWORD });
  ids = {
    statistician: userId(t.ctx, DEMO_EMAIL.statistician),
    supervisor: userId(t.ctx, DEMO_EMAIL.supervisor),
    viewer: userId(t.ctx, 'viewer@specimetry.test'),
    engineer: userId(t.ctx, DEMO_EMAIL.engineer),
  };
});
afterAll(() => t.close());

async function save(who: Client = c.engineer, sid = studyId): Promise<number> {
  const res = await who.post(`/api/studies/${sid}/analyses`, spec);
  expect(res.status).toBe(201);
  return res.body.analysis.id as number;
}

async function editRun(runId: number, value: string): Promise<void> {
  const sheet = await c.engineer.get(`/api/studies/${studyId}/runs`);
  const run = sheet.body.runs.find((r: { id: number }) => r.id === runId);
  const res = await c.engineer.patch(`/api/studies/${studyId}/runs/${runId}`, { version: run.version, values: { breaks: value } });
  expect(res.status).toBe(200);
}

function auditActions(analysisId: number): string[] {
  return (t.ctx.db.$client.prepare("select action from audit_events where entity = 'analysis' and entity_id = ? order by id").all(String(analysisId)) as { action: string }[]).map((a) => a.action);
}

describe('review, comments and sign-off of one analysis', () => {
  let aid: number;
  let threadId: number;

  it('a draft cannot be approved before a review is requested', async () => {
    aid = await save();
    const res = await c.supervisor.post(`/api/analyses/${aid}/approve`, {});
    expect(res.status).toBe(409);
    expect(res.body.message).toContain('draft');
  });

  it('only the owner requests a review, and only from study reviewers', async () => {
    expect((await c.statistician.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [ids.supervisor] })).status).toBe(403);
    const bad = await c.engineer.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [ids.statistician, ids.viewer] });
    expect(bad.status).toBe(400);
    expect(bad.body.message).toContain(`user ${ids.viewer}`);
    expect(bad.body.details[0].path).toBe('reviewerIds.1');
  });

  it('mails each reviewer a working link and notifies them in the app', async () => {
    const lastMail = t.ctx.db.$client.prepare('select coalesce(max(id), 0) as id from mail_messages').get() as { id: number };
    const res = await c.engineer.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [ids.statistician, ids.supervisor], message: 'Please check the interaction.' });
    expect(res.status).toBe(201);
    expect(res.body.mailed).toBe(2);
    expect(res.body.reviewRequests.map((r: { reviewer: { id: number } }) => r.reviewer.id)).toEqual([ids.statistician, ids.supervisor]);
    for (const role of ['statistician', 'supervisor'] as const) {
      const mail = await waitForMail(t.ctx, DEMO_EMAIL[role], lastMail.id);
      expect(mail.subject).toContain('Review requested');
      const link = linkIn(mail.textBody);
      expect(link.pathname).toBe(`/studies/${studyId}/analyses/${aid}`);
      // The link's ids open the analysis for the reviewer it was sent to.
      const [, , sid, , id] = link.pathname.split('/');
      expect(Number(sid)).toBe(studyId);
      expect((await c[role].get(`/api/analyses/${id}`)).body.analysis.status).toBe('in_review');
    }
    const notes = await c.statistician.get('/api/notifications?unread=1');
    expect(notes.body.unread).toBe(1);
    expect(notes.body.notifications[0]).toMatchObject({ kind: 'review-request', link: `/studies/${studyId}/analyses/${aid}`, readAt: null });
    const read = await c.statistician.post(`/api/notifications/${notes.body.notifications[0].id}/read`);
    expect(read.body.notification.readAt).toBeGreaterThan(0);
    expect((await c.supervisor.post(`/api/notifications/${notes.body.notifications[0].id}/read`)).status).toBe(404);
    expect((await c.statistician.get('/api/notifications?unread=1')).body.unread).toBe(0);
    expect((await c.engineer.get(`/api/studies/${studyId}`)).body.study.status).toBe('in_review');
    expect(auditActions(aid)).toEqual(['create', 'review-request', 'review-request', 'status']);
  });

  it('reviewers comment on a table row; viewers cannot comment', async () => {
    const res = await c.statistician.post(`/api/analyses/${aid}/comments`, { body: 'Is the W:T row driven by cell A:L?', anchor: 'anova:W:T' });
    expect(res.status).toBe(201);
    threadId = res.body.comment.id;
    expect(res.body.comment.anchor).toBe('anova:W:T');
    expect((await c.viewer.post(`/api/analyses/${aid}/comments`, { body: 'I see it too' })).status).toBe(403);
    expect((await c.viewer.get(`/api/analyses/${aid}/comments`)).status).toBe(200);
    const bad = await c.statistician.post(`/api/analyses/${aid}/comments`, { body: 'x', anchor: 'no spaces allowed here' });
    expect(bad.status).toBe(400);
    const owner = await c.engineer.get('/api/notifications');
    expect(owner.body.notifications.map((n: { kind: string }) => n.kind)).toContain('comment');
  });

  it('the owner answers; the reply joins the thread and takes its anchor; threads resolve', async () => {
    const reply = await c.engineer.post(`/api/analyses/${aid}/comments`, { body: 'Yes: A:L has the largest mean (44.6).', parentId: threadId });
    expect(reply.status).toBe(201);
    expect(reply.body.comment).toMatchObject({ parentId: threadId, anchor: 'anova:W:T' });
    const nested = await c.statistician.post(`/api/analyses/${aid}/comments`, { body: 'Thanks.', parentId: reply.body.comment.id });
    expect(nested.body.comment.parentId).toBe(threadId);
    expect((await c.engineer.post(`/api/analyses/${aid}/comments`, { body: 'x', parentId: 999999 })).status).toBe(400);
    const general = await c.supervisor.post(`/api/analyses/${aid}/comments`, { body: 'Overall fine.' });
    expect(general.body.comment.anchor).toBe('analysis');
    const resolved = await c.statistician.post(`/api/analyses/${aid}/comments/${threadId}/resolve`, {});
    expect(resolved.status).toBe(200);
    expect(resolved.body.thread.resolvedBy.id).toBe(ids.statistician);
    expect(resolved.body.thread.replies).toHaveLength(2);
    expect((await c.viewer.post(`/api/analyses/${aid}/comments/${threadId}/resolve`, { resolved: false })).status).toBe(403);
    const threads = await c.viewer.get(`/api/analyses/${aid}/comments?anchor=anova:W:T`);
    expect(threads.body.threads).toHaveLength(1);
    expect(threads.body.threads[0].resolvedAt).toBeGreaterThan(0);
  });

  it('a statistician cannot approve; the engineer cannot approve their own study; nor can an admin', async () => {
    const stat = await c.statistician.post(`/api/analyses/${aid}/approve`, {});
    expect(stat.status).toBe(403);
    expect(stat.body.message).toContain('supervisor');
    expect((await c.engineer.post(`/api/analyses/${aid}/approve`, {})).status).toBe(403);
    expect((await c.admin.post(`/api/analyses/${aid}/approve`, {})).status).toBe(403);
    const view = await c.statistician.get(`/api/analyses/${aid}`);
    expect(view.body.analysis.can.approve).toBe(false);
  });

  it('a supervisor approves: the analysis freezes and the study is approved', async () => {
    expect((await c.supervisor.get(`/api/analyses/${aid}`)).body.analysis.can).toMatchObject({ approve: true, approveRefusal: null });
    const res = await c.supervisor.post(`/api/analyses/${aid}/approve`, { note: 'checked' });
    expect(res.status).toBe(200);
    expect(res.body.analysis).toMatchObject({ status: 'approved', stale: false, approvedBy: { id: ids.supervisor } });
    const approved = (await c.engineer.get(`/api/studies/${studyId}`)).body.study;
    expect(approved.status).toBe('approved');
    expect(approved.approval).toMatchObject({ analysisId: aid, dataChanged: false });
    expect(auditActions(aid)).toContain('approve');
    const again = await c.supervisor.post(`/api/analyses/${aid}/approve`, {});
    expect(again.status).toBe(409);
    expect(again.body.message).toContain('already approved');
    expect((await c.engineer.get('/api/notifications')).body.notifications[0].kind).toBe('approved');
  });

  it('records the recommendation only from the approved analysis, and links back', async () => {
    const bad = await c.engineer.put(`/api/studies/${studyId}/recommendation`, { analysisId: aid, settings: [{ factor: 'T', level: 'X' }], rationale: 'Lowest breaks at high tension.' });
    expect(bad.status).toBe(400);
    expect(bad.body.message).toContain('"X"');
    const tol = await c.engineer.put(`/api/studies/${studyId}/recommendation`, { analysisId: aid, settings: [{ factor: 'T', level: 'H', tolerancePlus: 1 }], rationale: 'Lowest breaks at high tension.' });
    expect(tol.status).toBe(400);
    expect((await c.viewer.put(`/api/studies/${studyId}/recommendation`, { analysisId: aid, settings: [{ factor: 'T', level: 'H' }], rationale: 'Lowest breaks at high tension.' })).status).toBe(403);
    const ok = await c.engineer.put(`/api/studies/${studyId}/recommendation`, { analysisId: aid, settings: [{ factor: 'W', level: 'B' }, { factor: 'T', level: 'H' }], rationale: 'Lowest mean breaks (B:H, 18.8) with the smallest scatter.' });
    expect(ok.status).toBe(200);
    expect(ok.body.recommendation).toMatchObject({ analysisId: aid, analysisLink: `/studies/${studyId}/analyses/${aid}`, stale: false });
    expect((await c.viewer.get(`/api/studies/${studyId}/recommendation`)).body.recommendation.id).toBe(ok.body.recommendation.id);
  });

  it('editing a run after approval makes the approved analysis stale; approval and recommendation are then refused', async () => {
    const listed = async () => ((await c.viewer.get('/api/studies')).body.studies as { id: number; approval: unknown }[]).find((s) => s.id === studyId)!.approval;
    expect(await listed()).toMatchObject({ analysisId: aid, dataChanged: false });
    await editRun(runIds[2]!, '55'); // warpbreaks row 3 is 54 (R datasets, warpbreaks.json)
    const view = await c.supervisor.get(`/api/analyses/${aid}`);
    expect(view.body.analysis).toMatchObject({ status: 'approved', stale: true });
    // the study says so too, in its header and in the list (common practice, no source)
    expect((await c.viewer.get(`/api/studies/${studyId}`)).body.study.approval).toMatchObject({ analysisId: aid, dataChanged: true });
    expect(await listed()).toMatchObject({ analysisId: aid, dataChanged: true });
    expect(view.body.analysis.changes.edited).toEqual([{ runId: runIds[2], code: 'R0003', field: 'value', oldValue: '54', newValue: '55' }]);
    expect((await c.supervisor.post(`/api/analyses/${aid}/approve`, {})).status).toBe(409);
    const rec = await c.engineer.put(`/api/studies/${studyId}/recommendation`, { analysisId: aid, settings: [{ factor: 'T', level: 'H' }], rationale: 'Lowest breaks at high tension.' });
    expect(rec.status).toBe(409);
    expect((await c.engineer.get(`/api/studies/${studyId}/recommendation`)).body.recommendation.stale).toBe(true);
  });

  it('a new analysis whose data change while in review is refused at approval (hash re-checked)', async () => {
    const a2 = await save();
    expect((await c.engineer.post(`/api/analyses/${a2}/review-requests`, { reviewerIds: [ids.supervisor] })).status).toBe(201);
    await editRun(runIds[3]!, '26'); // warpbreaks row 4 is 25 (warpbreaks.json)
    const res = await c.supervisor.post(`/api/analyses/${a2}/approve`, {});
    expect(res.status).toBe(409);
    expect(res.body.message).toContain('changed since it was saved');
    expect(res.body.current.changes.edited[0]).toMatchObject({ code: 'R0004', oldValue: '25', newValue: '26' });
    expect((await c.engineer.post(`/api/analyses/${a2}/review-requests`, { reviewerIds: [ids.supervisor] })).status).toBe(409);
  });
});

describe('returns and the four-eyes rule', () => {
  it('a supervisor returns with a reason; the owner is told and can ask again', async () => {
    const aid = await save(c.engineer, study2);
    expect((await c.engineer.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [ids.supervisor] })).status).toBe(201);
    expect((await c.engineer.get(`/api/studies/${study2}`)).body.study.status).toBe('in_review');
    expect((await c.supervisor.post(`/api/analyses/${aid}/return`, {})).status).toBe(400);
    expect((await c.statistician.post(`/api/analyses/${aid}/return`, { reason: 'Check the residuals' })).status).toBe(403);
    const res = await c.supervisor.post(`/api/analyses/${aid}/return`, { reason: 'Use Type II and show Welch beside the table.' });
    expect(res.status).toBe(200);
    expect(res.body.analysis).toMatchObject({ status: 'returned', returnedReason: 'Use Type II and show Welch beside the table.' });
    expect((await c.engineer.get(`/api/studies/${study2}`)).body.study.status).toBe('analysed');
    expect((await c.engineer.get('/api/notifications')).body.notifications[0]).toMatchObject({ kind: 'returned' });
    expect((await c.supervisor.post(`/api/analyses/${aid}/approve`, {})).status).toBe(409);
    expect(auditActions(aid)).toContain('return');
    expect((await c.engineer.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [ids.supervisor] })).status).toBe(201);
  });

  it('the supervisor who saved an analysis cannot sign it off', async () => {
    const aid = await save(c.supervisor, study2);
    expect((await c.engineer.post(`/api/analyses/${aid}/review-requests`, { reviewerIds: [ids.supervisor] })).status).toBe(201);
    const res = await c.supervisor.post(`/api/analyses/${aid}/approve`, {});
    expect(res.status).toBe(403);
    expect(res.body.message).toContain('second person');
  });

  it('notifications can all be marked read', async () => {
    const res = await c.supervisor.post('/api/notifications/read-all');
    expect(res.body.updated).toBeGreaterThan(0);
    expect((await c.supervisor.get('/api/notifications?unread=1')).body).toMatchObject({ unread: 0, notifications: [] });
  });
});
