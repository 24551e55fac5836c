import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/services/seed.js';
import { Client, DEMO_EMAIL, linkIn, signIn, startTestApp, waitForMail, type TestApp } from './harness.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '4', LOGIN_LIMIT_PER_IP: '40' });
});
afterAll(() => t.close());

describe('health and config', () => {
  it('reports ok, the database and the migration level', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'ok', db: 'ok', version: '0.1.0' });
    expect(res.body.migrations.applied).toBeGreaterThanOrEqual(1);
  });
  it('unknown API paths get a JSON 404', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.message).toMatch(/No API route GET \/no-such-thing/);
  });
  it('sets security headers (helmet) with a CSP that allows only our own scripts', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.headers['content-security-policy']).toMatch(/script-src 'self'/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['x-request-id']).toMatch(/[\w-]{8,}/);
  });
});

describe('sign-in', () => {
  it('signs in a demo account, returns the user and regenerates the session id', async () => {
    const c = new Client(t.app);
    await c.prime();
    const before = String(c.agent.jar.getCookie('specimetry.sid', { path: '/', domain: '127.0.0.1', secure: false, script: false })?.value ?? '');
    const res = await c.post('/api/auth/login', { email: DEMO_EMAIL.engineer, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: DEMO_EMAIL.engineer, role: 'engineer' });
    const setCookie = String(res.headers['set-cookie']);
    expect(setCookie).toMatch(/specimetry\.sid=/);
    expect(setCookie).toMatch(/HttpOnly/);
    expect(setCookie).toMatch(/SameSite=Lax/);
    expect(setCookie).not.toContain(before || 'no-previous-session');
    const me = await c.get('/api/me');
    expect(me.body.user.email).toBe(DEMO_EMAIL.engineer);
  });

  it('refuses a wrong password with a clear message and never reveals which part was wrong', async () => {
    const c = new Client(t.app);
    const res = await c.post('/api/auth/login', { email: DEMO_EMAIL.statistician, password: 'nope-nope-nope' });
    expect(res.status).toBe(401);
    expect(res.body.message).toBe('E-mail or password is not correct');
    const unknown = await c.post('/api/auth/login', { email: 'nobody@specimetry.test', password: 'nope-nope-nope' });
    expect(unknown.body.message).toBe(res.body.message);
  });

  it('validates the body (400 with field details)', async () => {
    const res = await new Client(t.app).post('/api/auth/login', { email: 'not-an-email' });
    expect(res.status).toBe(400);
    expect(res.body.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('refuses a mutating call without the XSRF header', async () => {
    const res = await request(t.app).post('/api/auth/login').send({ email: DEMO_EMAIL.admin, password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.message).toMatch(/XSRF/);
  });

  it('rate-limits sign-in per account with a clear message', async () => {
    const c = new Client(t.app);
    for (let i = 0; i < 4; i++) await c.post('/api/auth/login', { email: DEMO_EMAIL.supervisor, password: 'wrong-password-' + i });
    const res = await c.post('/api/auth/login', { email: DEMO_EMAIL.supervisor, password: DEMO_PASSWORD });
    expect(res.status).toBe(429);
    expect(res.body.message).toMatch(/Too many sign-in attempts for this account\. Try again in \d+ minutes?/);
    expect(res.headers['retry-after']).toBeDefined();
  });

  it('signs out and destroys the session', async () => {
    const c = await signIn(t.app, 'admin');
    expect((await c.post('/api/auth/logout')).status).toBe(204);
    expect((await c.get('/api/me')).status).toBe(401);
  });
});

describe('invitations', () => {
  it('admin invites, the mail link is single-use, the invitee is signed in with the role', async () => {
    const admin = await signIn(t.app, 'admin');
    const res = await admin.post('/api/invitations', { email: 'new.engineer@lab.test', role: 'engineer', name: 'New Engineer' });
    expect(res.status).toBe(201);
    expect(res.body.invitation.tokenHash).toBeUndefined();
    const mail = await waitForMail(t.ctx, 'new.engineer@lab.test');
    expect(mail.subject).toMatch(/invited/);
    const link = linkIn(mail.textBody);
    expect(link.pathname).toBe('/accept-invitation');
    const token = link.searchParams.get('token')!;
    const anon = new Client(t.app);
    expect((await anon.get('/api/invitations/lookup?token=' + token)).body).toMatchObject({ email: 'new.engineer@lab.test', role: 'engineer' });
    const weak = await anon.post('/api/invitations/accept', { token, name: 'New', password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.details[0]).toMatchObject({ path: 'password', message: 'Use at least 12 characters' });
    const ok = await anon.post('/api/invitations/accept', { token, name: 'New Engineer', password: 'a long enough passphrase' });
    expect(ok.status).toBe(201);
    expect((await anon.get('/api/me')).body.user).toMatchObject({ email: 'new.engineer@lab.test', role: 'engineer' });
    const again = await new Client(t.app).post('/api/invitations/accept', { token, name: 'X', password: 'a long enough passphrase' });
    expect(again.status).toBe(410);
  });

  it('non-admins cannot invite', async () => {
    const eng = await signIn(t.app, 'engineer');
    expect((await eng.post('/api/invitations', { email: 'x@lab.test', role: 'admin' })).status).toBe(403);
  });
});

describe('password reset and account', () => {
  it('resets through the mailed link; the old password and old sessions stop working', async () => {
    const email = 'reset.me@lab.test';
    const admin = await signIn(t.app, 'admin');
    await admin.post('/api/invitations', { email, role: 'statistician' });
    const inviteToken = linkIn((await waitForMail(t.ctx, email)).textBody).searchParams.get('token')!;
    await new Client(t.app).post('/api/invitations/accept', { token: inviteToken, name: 'Reset Me', password: 'first passphrase here' });
    const oldSession = await signIn(t.app, { email, password: 'first passphrase here' });
    const lastId = (t.ctx.db.$client.prepare('select max(id) as m from mail_messages').get() as { m: number }).m;

    const anon = new Client(t.app);
    const req = await anon.post('/api/auth/password-reset', { email });
    expect(req.status).toBe(202);
    const unknown = await anon.post('/api/auth/password-reset', { email: 'who@lab.test' });
    expect(unknown.body.message).toBe(req.body.message);
    const link = linkIn((await waitForMail(t.ctx, email, lastId)).textBody);
    expect(link.pathname).toBe('/reset-password');
    const token = link.searchParams.get('token')!;
    expect((await anon.post('/api/auth/password-reset/confirm', { token, password: 'second passphrase here' })).status).toBe(204);
    expect((await anon.post('/api/auth/password-reset/confirm', { token, password: 'third passphrase here' })).status).toBe(400);
    expect((await oldSession.get('/api/me')).status).toBe(401);
    const bad = await new Client(t.app).post('/api/auth/login', { email, password: 'first passphrase here' });
    expect(bad.status).toBe(401);
    const c = await signIn(t.app, { email, password: 'second passphrase here' });
    expect((await c.post('/api/account/password', { currentPassword: 'wrong', newPassword: 'third passphrase here' })).status).toBe(400);
    expect((await c.post('/api/account/password', { currentPassword: 'second passphrase here', newPassword: 'third passphrase here' })).status).toBe(204);
    await signIn(t.app, { email, password: 'third passphrase here' });
  });
});

describe('user administration', () => {
  it('admin changes a role and deactivation ends the user sessions', async () => {
    const admin = await signIn(t.app, 'admin');
    const list = await admin.get('/api/users');
    const sup = list.body.users.find((u: { email: string }) => u.email === DEMO_EMAIL.supervisor);
    const supClient = await signIn(t.app, 'statistician');
    const stat = list.body.users.find((u: { email: string }) => u.email === DEMO_EMAIL.statistician);
    expect((await admin.patch(`/api/users/${stat.id}`, { active: false })).body.user.active).toBe(false);
    expect((await supClient.get('/api/me')).status).toBe(401);
    const refused = await new Client(t.app).post('/api/auth/login', { email: DEMO_EMAIL.statistician, password: DEMO_PASSWORD });
    expect(refused.body.message).toMatch(/deactivated/);
    await admin.patch(`/api/users/${stat.id}`, { active: true });
    expect((await admin.patch(`/api/users/${sup.id}`, { role: 'engineer' })).body.user.role).toBe('engineer');
    await admin.patch(`/api/users/${sup.id}`, { role: 'supervisor' });
    const self = list.body.users.find((u: { email: string }) => u.email === DEMO_EMAIL.admin);
    expect((await admin.patch(`/api/users/${self.id}`, { active: false })).status).toBe(400);
    expect((await admin.patch(`/api/users/${sup.id}`, {})).status).toBe(400);
  });
});
