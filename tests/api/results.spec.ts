import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApp, type Client, type TestApp } from './harness.js';
import { seedStudy, studyFingerprint, type SeededStudy } from './hardening-study.js';

// Bulk result push. Idempotency semantics follow the IETF HTTPAPI draft "The Idempotency-Key HTTP
// Header Field" (draft-ietf-httpapi-idempotency-key-header-06 §2.6: same key + same payload → the
// stored response; same key + different payload → 422). Decimal text rules are the run sheet's
// (shared/studies.ts DECIMAL_RE: a comma decimal mark is refused, not guessed).

let t: TestApp;
let s: SeededStudy;
let owner: Client;
let writeToken: string;
let readToken: string;

beforeAll(async () => {
  t = await startTestApp();
  s = seedStudy(t.ctx, { members: [{ email: 'supervisor@specimetry.test', role: 'viewer' }] });
  owner = await signIn(t.app, 'engineer');
  writeToken = (await owner.post('/api/tokens', { name: 'push script', scope: 'write', expiresInDays: 7 })).body.secret;
  readToken = (await owner.post('/api/tokens', { name: 'read script', scope: 'read', expiresInDays: 7 })).body.secret;
});
afterAll(() => t.close());

const url = () => `/api/studies/${s.studyId}/results`;
function push(body: unknown, key?: string, token = writeToken) {
  const req = request(t.app).post(url()).set('Authorization', `Bearer ${token}`);
  return (key ? req.set('Idempotency-Key', key) : req).send(body as object);
}
async function viaSession(client: Client, body: unknown) {
  if (!client.xsrf) await client.prime();
  return client.agent.post(url()).set('X-XSRF-TOKEN', client.xsrf).set('Idempotency-Key', 'batch-0010-jjjj').send(body as object);
}
function valueOf(runId: number, sym: string): string | undefined {
  const row = t.ctx.db.$client
    .prepare('select v.text from run_values v join responses r on r.id = v.response_id where v.run_id = ? and r.symbol = ?')
    .get(runId, sym) as { text: string } | undefined;
  return row?.text;
}
function runRow(runId: number) {
  return t.ctx.db.$client.prepare('select version, notes, outcome_id as outcomeId from runs where id = ?').get(runId) as { version: number; notes: string; outcomeId: number | null };
}

describe('POST /api/studies/:id/results', () => {
  it('stores values as typed, outcome and notes, found by numeric id or run code, and audits each field with the token', async () => {
    const [a, b] = [s.runs[0]!, s.runs[1]!];
    const body = [
      { runId: a.id, values: { H: '0.850', r: 1.25 }, outcome: 'Valid', notes: 'FE batch 12' },
      { runId: b.code, values: { H: '1e-1' } },
    ];
    const res = await push(body, 'batch-0001-aaaa');
    expect(res.status).toBe(200);
    expect(res.body.changed).toEqual({ runs: 2, fields: 5 });
    expect(res.body.results.map((r: { code: string }) => r.code)).toEqual([a.code, b.code]);
    expect(valueOf(a.id, 'H')).toBe('0.850');
    expect(valueOf(a.id, 'r')).toBe('1.25');
    expect(valueOf(b.id, 'H')).toBe('1e-1');
    expect(runRow(a.id).notes).toBe('FE batch 12');
    expect(runRow(a.id).version).toBe(2);
    const audit = t.ctx.db.$client
      .prepare("select field, new_value as v, token_id as tokenId from audit_events where study_id = ? and action = 'push' and entity = 'run' order by id")
      .all(s.studyId) as { field: string; v: string; tokenId: number | null }[];
    expect(audit.map((x) => x.field)).toEqual(['value:H', 'value:r', 'outcome', 'notes', 'value:H']);
    expect(audit.every((x) => x.tokenId !== null)).toBe(true);
    const summary = t.ctx.db.$client.prepare("select count(*) as n from audit_events where entity = 'results-push' and entity_id = 'batch-0001-aaaa'").get() as { n: number };
    expect(summary.n).toBe(1);
  });

  it('replays the stored response for the same key and body (key order ignored) and changes nothing', async () => {
    const body = [{ runId: s.runs[2]!.id, values: { H: '0.91', r: '1.10' } }];
    const first = await push(body, 'batch-0002-bbbb');
    expect(first.status).toBe(200);
    const before = studyFingerprint(t.ctx, s.studyId);
    const again = await push([{ values: { r: '1.10', H: '0.91' }, runId: s.runs[2]!.id }], 'batch-0002-bbbb');
    expect(again.status).toBe(200);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.body).toEqual(first.body);
    expect(studyFingerprint(t.ctx, s.studyId)).toBe(before);
  });

  it('refuses the same key with a different body (422) and changes nothing', async () => {
    const before = studyFingerprint(t.ctx, s.studyId);
    const res = await push([{ runId: s.runs[2]!.id, values: { H: '0.99' }, version: 2 }], 'batch-0002-bbbb');
    expect(res.status).toBe(422);
    expect(res.body.message).toContain('batch-0002-bbbb');
    expect(studyFingerprint(t.ctx, s.studyId)).toBe(before);
  });

  it('is all-or-nothing: one bad value refuses the whole push, naming it, and the key stays usable', async () => {
    const [x, y, z] = [s.runs[3]!, s.runs[4]!, s.runs[5]!];
    const before = studyFingerprint(t.ctx, s.studyId);
    const bad = await push([{ runId: x.id, values: { H: '0.5' } }, { runId: y.id, values: { H: '0.6' } }, { runId: z.id, values: { H: '1,5' } }], 'batch-0003-cccc');
    expect(bad.status).toBe(400);
    expect(bad.body.message).toContain('2.values.H');
    expect(bad.body.message).toContain('"1,5" uses a comma');
    expect(studyFingerprint(t.ctx, s.studyId)).toBe(before);
    const fixed = await push([{ runId: x.id, values: { H: '0.5' } }, { runId: y.id, values: { H: '0.6' } }, { runId: z.id, values: { H: '1.5' } }], 'batch-0003-cccc');
    expect(fixed.status).toBe(200);
    expect(valueOf(z.id, 'H')).toBe('1.5');
  });

  it('finds runs by settings, filling replicates in run order, and names unknown levels and missing factors', async () => {
    // A cell of the factorial whose two replicates are both still empty (runs are in run order).
    const free = s.runs.filter((r) => valueOf(r.id, 'H') === undefined && valueOf(r.id, 'r') === undefined);
    const pick = free.find((r) => free.filter((o) => o.settings['W'] === r.settings['W'] && o.settings['A'] === r.settings['A']).length === 2)!;
    const candidates = free.filter((o) => o.settings['W'] === pick.settings['W'] && o.settings['A'] === pick.settings['A']);
    const settings = { W: pick.settings['W']!, A: Number(pick.settings['A']) };
    const res = await push([{ settings, values: { H: '0.7' } }, { settings: { W: `${pick.settings['W']}0`, A: pick.settings['A']! }, values: { H: '0.8' } }], 'batch-0004-dddd');
    expect(res.status).toBe(200);
    expect(res.body.results.map((r: { runId: number }) => r.runId)).toEqual(candidates.map((c) => c.id));
    const third = await push([{ settings, values: { H: '0.9' } }], 'batch-0005-eeee');
    expect(third.status).toBe(400);
    expect(third.body.message).toContain('already have results');

    const unknown = await push([{ settings: { W: '0.6', A: '30' }, values: { H: '1' } }], 'batch-0006-ffff');
    expect(unknown.status).toBe(400);
    expect(unknown.body.message).toContain('"0.6" is not a level of W');
    const missing = await push([{ settings: { W: '0.5' }, values: { H: '1' } }], 'batch-0006-ffff');
    expect(missing.status).toBe(400);
    expect(missing.body.details[0]).toMatchObject({ path: '0.settings.A' });
    const outcome = await push([{ runId: s.runs[6]!.id, outcome: 'exploded' }], 'batch-0006-ffff');
    expect(outcome.status).toBe(400);
    expect(outcome.body.message).toContain('"exploded" is not one of this study\'s outcomes');
  });

  it('keeps the sheet\'s concurrency rules: no silent overwrite without version, 409 on a stale version', async () => {
    const run = s.runs[0]!; // H = 0.850 from the first push, version 2
    const before = studyFingerprint(t.ctx, s.studyId);
    const blind = await push([{ runId: run.id, values: { H: '0.9' } }], 'batch-0007-gggg');
    expect(blind.status).toBe(409);
    expect(blind.body.message).toContain('values.H (recorded 0.850)');
    expect(blind.body.current.version).toBe(2);
    const stale = await push([{ runId: run.id, values: { H: '0.9' }, version: 1 }], 'batch-0007-gggg');
    expect(stale.status).toBe(409);
    expect(stale.body.current.values.H.text).toBe('0.850');
    expect(studyFingerprint(t.ctx, s.studyId)).toBe(before);
    const current = await push([{ runId: run.id, values: { H: '0.9' }, version: 2 }], 'batch-0007-gggg');
    expect(current.status).toBe(200);
    expect(valueOf(run.id, 'H')).toBe('0.9');
  });

  it('accepts the key in the body, and refuses a missing, malformed or contradicting key', async () => {
    const item = { runId: s.runs[7]!.id, values: { r: '2.0' } };
    expect((await push([item])).status).toBe(400);
    expect((await push([item], 'short')).status).toBe(400);
    const both = await push({ idempotencyKey: 'batch-0008-hhhh', results: [item] }, 'batch-0008-other');
    expect(both.status).toBe(400);
    expect(both.body.message).toContain('differ');
    const ok = await push({ idempotencyKey: 'batch-0008-hhhh', results: [item], reason: 'FE batch 13' });
    expect(ok.status).toBe(200);
    expect(valueOf(s.runs[7]!.id, 'r')).toBe('2.0');
    const extra = await push([{ ...item, colour: 'red' }], 'batch-0009-iiii');
    expect(extra.status).toBe(400);
  });

  it('needs a write token or an editing member, and hides the study from non-members', async () => {
    const item = [{ runId: s.runs[8]!.id, values: { H: '1.0' } }];
    const before = studyFingerprint(t.ctx, s.studyId);
    expect((await push(item, 'batch-0010-jjjj', readToken)).status).toBe(403);
    const viewer = await signIn(t.app, 'supervisor');
    const asViewer = await viaSession(viewer, item);
    expect(asViewer.status).toBe(403);
    const stranger = await signIn(t.app, 'statistician');
    const asStranger = await viaSession(stranger, item);
    expect(asStranger.status).toBe(404);
    expect(studyFingerprint(t.ctx, s.studyId)).toBe(before);
    // The cookie session of the owner works too (with its XSRF header).
    const asOwner = await viaSession(owner, item);
    expect(asOwner.status).toBe(200);
  });
});
