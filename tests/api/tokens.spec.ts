import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sha256Hex } from '../../server/auth/secret-tokens.js';
import { TOKEN_MAX_DAYS } from '../../shared/tokens.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';

// Personal access tokens. Expected behaviour comes from RFC 6750 (Bearer token usage: a missing,
// invalid, expired or revoked token is 401 "invalid_token"; a token lacking the scope is 403
// "insufficient_scope", §3.1) and from the OWASP CSRF Prevention Cheat Sheet (requests without
// ambient credentials — no cookies — are not exposed to CSRF).

let t: TestApp;
let engineer: Client;
let admin: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  admin = await signIn(t.app, 'admin');
});
afterAll(() => t.close());

async function mint(client: Client, scope: 'read' | 'write', name = `${scope} token`): Promise<{ id: number; secret: string }> {
  const res = await client.post('/api/tokens', { name, scope, expiresInDays: 30 });
  expect(res.status).toBe(201);
  return { id: res.body.token.id as number, secret: res.body.secret as string };
}

/** A script's call: no cookie jar, no XSRF header, only the Authorization header. */
function bearer(method: 'get' | 'post' | 'patch' | 'delete', url: string, secret: string) {
  return request(t.app)[method](url).set('Authorization', `Bearer ${secret}`);
}

function userId(email: string): number {
  return (t.ctx.db.$client.prepare('select id from users where email = ?').get(email) as { id: number }).id;
}

describe('creating and listing tokens', () => {
  it('returns the secret once and stores only its SHA-256', async () => {
    const res = await engineer.post('/api/tokens', { name: 'FE batch uploader', scope: 'write', expiresInDays: 90 });
    expect(res.status).toBe(201);
    const secret = res.body.secret as string;
    expect(secret.startsWith('spm_')).toBe(true);
    expect(res.body.token).toMatchObject({ name: 'FE batch uploader', scope: 'write', status: 'active', prefix: secret.slice(0, 12) });
    const row = t.ctx.db.$client.prepare('select token_hash as h, expires_at as e, created_at as c from api_tokens where id = ?').get(res.body.token.id) as { h: string; e: number; c: number };
    expect(row.h).toBe(sha256Hex(secret));
    expect(Math.round((row.e - row.c) / 86_400_000)).toBe(90);
    const dump = JSON.stringify(t.ctx.db.$client.prepare('select * from api_tokens').all());
    expect(dump).not.toContain(secret);

    const list = await engineer.get('/api/tokens');
    expect(list.status).toBe(200);
    expect(list.body.tokens.map((x: { name: string }) => x.name)).toContain('FE batch uploader');
    expect(JSON.stringify(list.body)).not.toContain(secret);
  });

  it('refuses a token without expiry, beyond the maximum, or with an unknown scope, naming the field', async () => {
    const noExpiry = await engineer.post('/api/tokens', { name: 'x', scope: 'read' });
    expect(noExpiry.status).toBe(400);
    expect(noExpiry.body.details.map((d: { path: string }) => d.path)).toContain('expiresInDays');
    const tooLong = await engineer.post('/api/tokens', { name: 'x', scope: 'read', expiresInDays: TOKEN_MAX_DAYS + 1 });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.message).toContain(`at most ${TOKEN_MAX_DAYS} days`);
    const scope = await engineer.post('/api/tokens', { name: 'x', scope: 'admin', expiresInDays: 10 });
    expect(scope.status).toBe(400);
    expect(scope.body.details[0].path).toBe('scope');
  });

  it('lists only the caller\'s own tokens and will not revoke somebody else\'s', async () => {
    const mine = await mint(admin, 'read', 'admin-only token');
    const list = await engineer.get('/api/tokens');
    expect(list.body.tokens.map((x: { id: number }) => x.id)).not.toContain(mine.id);
    const res = await engineer.delete(`/api/tokens/${mine.id}`);
    expect(res.status).toBe(404);
    expect((await bearer('get', '/api/me', mine.secret)).status).toBe(200);
  });

  it('does not let a token create, list or revoke tokens', async () => {
    const w = await mint(engineer, 'write');
    const create = await bearer('post', '/api/tokens', w.secret).send({ name: 'child', scope: 'write', expiresInDays: 365 });
    expect(create.status).toBe(403);
    expect((await bearer('get', '/api/tokens', w.secret)).status).toBe(403);
    expect((await bearer('delete', `/api/tokens/${w.id}`, w.secret)).status).toBe(403);
  });
});

describe('calling the API with a token', () => {
  it('acts as the owner, with the owner\'s own permissions', async () => {
    const eng = await mint(engineer, 'write');
    const me = await bearer('get', '/api/me', eng.secret);
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ user: { email: 'engineer@specimetry.test', role: 'engineer' }, viaToken: true });
    expect((await bearer('get', '/api/users', eng.secret)).status).toBe(403);
    const adm = await mint(admin, 'read');
    expect((await bearer('get', '/api/users', adm.secret)).status).toBe(200);
  });

  it('refuses a read token on a write route with 403 and accepts a write token there without CSRF', async () => {
    const target = userId('statistician@specimetry.test');
    const read = await mint(admin, 'read');
    const refused = await bearer('patch', `/api/users/${target}`, read.secret).send({ name: 'Stat Renamed' });
    expect(refused.status).toBe(403);
    expect(refused.body.message).toContain('read-only');
    const before = t.ctx.db.$client.prepare('select name from users where id = ?').get(target) as { name: string };
    expect(before.name).not.toBe('Stat Renamed');

    const write = await mint(admin, 'write');
    const ok = await bearer('patch', `/api/users/${target}`, write.secret).send({ name: 'Stat Renamed' });
    expect(ok.status).toBe(200);
    expect(ok.body.user.name).toBe('Stat Renamed');
  });

  it('answers 401 for a revoked, an expired, an unknown or a malformed token', async () => {
    const tok = await mint(engineer, 'read');
    expect((await bearer('get', '/api/me', tok.secret)).status).toBe(200);
    const rev = await engineer.delete(`/api/tokens/${tok.id}`);
    expect(rev.status).toBe(200);
    expect(rev.body.token.status).toBe('revoked');
    const revoked = await bearer('get', '/api/me', tok.secret);
    expect(revoked.status).toBe(401);
    expect(revoked.body.message).toContain('revoked');

    const old = await mint(engineer, 'read');
    t.ctx.db.$client.prepare('update api_tokens set expires_at = ? where id = ?').run(Date.now() - 1000, old.id);
    const expired = await bearer('get', '/api/me', old.secret);
    expect(expired.status).toBe(401);
    expect(expired.body.message).toContain('expired');
    const list = await engineer.get('/api/tokens');
    expect(list.body.tokens.find((x: { id: number }) => x.id === old.id).status).toBe('expired');

    expect((await bearer('get', '/api/me', 'spm_' + 'x'.repeat(43))).status).toBe(401);
    expect((await request(t.app).get('/api/me').set('Authorization', 'Basic abc')).status).toBe(401);
  });

  it('still requires the XSRF header for cookie-session calls', async () => {
    const client = await signIn(t.app, 'engineer');
    const noHeader = await client.agent.post('/api/tokens').send({ name: 'x', scope: 'read', expiresInDays: 1 });
    expect(noHeader.status).toBe(403);
    expect(noHeader.body.message).toContain('XSRF');
    const withHeader = await client.post('/api/tokens', { name: 'x', scope: 'read', expiresInDays: 1 });
    expect(withHeader.status).toBe(201);
  });

  it('records token writes in the audit trail on every call and token reads once per hour', async () => {
    // The middleware sits in front of the feature routers, so the token routes (refused to tokens)
    // exercise it: a refused write is still a write attempt worth tracing.
    const tok = await mint(engineer, 'write', 'audited');
    for (let i = 0; i < 3; i++) expect((await bearer('get', '/api/tokens', tok.secret)).status).toBe(403);
    expect((await bearer('delete', `/api/tokens/${tok.id}`, tok.secret)).status).toBe(403);
    expect((await bearer('post', '/api/tokens', tok.secret).send({})).status).toBe(403);
    const rows = t.ctx.db.$client
      .prepare('select action, field, new_value as status, user_id as userId from audit_events where token_id = ? order by id')
      .all(tok.id) as { action: string; field: string; status: string; userId: number }[];
    expect(rows.filter((r) => r.action === 'token-read')).toHaveLength(1);
    const writes = rows.filter((r) => r.action === 'token-write');
    expect(writes).toHaveLength(2);
    expect(writes[0]).toMatchObject({ field: `DELETE /api/tokens/${tok.id}`, status: '403', userId: userId('engineer@specimetry.test') });
    const created = t.ctx.db.$client.prepare("select count(*) as n from audit_events where entity = 'api-token' and action = 'create' and entity_id = ?").get(String(tok.id)) as { n: number };
    expect(created.n).toBe(1);
  });
});
